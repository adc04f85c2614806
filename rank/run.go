package rank

import (
	"context"
	"errors"
	"fmt"
	"math"
	"math/bits"
	"runtime"
	"sort"
	"strings"
	"sync"
	"sync/atomic"

	"tidesift/rank/physics"
	"tidesift/rank/profile"
	"tidesift/rank/sensitivity"
	"tidesift/rank/stats"
	"tidesift/rank/uncertain"
	"tidesift/schema"
)

// DefaultSamples is the Monte Carlo sample count when Options.Samples is 0.
const DefaultSamples = 10000

// ChunkSize is the number of samples drawn from one generator stream. It is
// part of the reproducibility contract: changing it changes every result.
const ChunkSize = 1024

// MaxCells bounds targets × samples (the float32 score matrix, 4 bytes a cell).
const MaxCells = 1 << 30

// Options adjust Run. The zero value gives the defaults.
type Options struct {
	Samples  int    // Monte Carlo samples per target; 0: DefaultSamples
	Seed     uint64 // generator seed; 0: 1
	Workers  int    // goroutines; 0: runtime.GOMAXPROCS(0). Results do not depend on it.
	TopK     int    // k of P(rank ≤ k); 0: the profile's top_k
	Filter   Filter
	Progress func(done, total int) // called after each target is sampled, never concurrently; may be nil
}

// Filter selects the moons to rank; empty lists select all. Names match as
// schema.NameKey does (case and spacing ignored).
type Filter struct {
	Planets []string
	Stars   []string
}

func (f Filter) match(planet, star string) bool {
	in := func(list []string, name string) bool {
		if len(list) == 0 {
			return true
		}
		k := schema.NameKey(name)
		for _, s := range list {
			if schema.NameKey(s) == k {
				return true
			}
		}
		return false
	}
	return in(f.Planets, planet) && in(f.Stars, star)
}

// target is one moon being ranked.
type target struct {
	moon *schema.Body
	plan *plan
	star string
	out  *Target
}

// Run ranks the catalog's moons under prof by Monte Carlo: for each moon it
// draws Samples joint samples of its uncertain inputs, evaluates the physics
// and the profile's score in each, summarises the metrics and the score, and
// then ranks all targets sample by sample to give rank statistics. See
// MethodText for the method and DEVELOPERS.md for the JSON contract.
//
// A moon lacking a required input that the profile has no prior for is left
// out and listed in Result.Excluded (with a warning): a score computed without
// it would mean nothing. The same catalog revision, profile, seed and sample
// count give byte-identical results for any Workers.
func Run(ctx context.Context, cat *schema.Catalog, prof *profile.Profile, opt Options) (*Result, error) {
	if cat == nil || prof == nil {
		return nil, errors.New("rank: nil catalog or profile")
	}
	if opt.Samples < 0 || opt.Workers < 0 || opt.TopK < 0 {
		return nil, fmt.Errorf("rank: negative samples (%d), workers (%d) or top k (%d)", opt.Samples, opt.Workers, opt.TopK)
	}
	S := opt.Samples
	if S == 0 {
		S = DefaultSamples
	}
	seed := opt.Seed
	if seed == 0 {
		seed = 1
	}
	k := opt.TopK
	if k == 0 {
		k = prof.TopK
	}
	res := &Result{
		FormatVersion:   FormatVersion,
		CatalogRevision: cat.Revision.ID,
		CatalogHash:     cat.ContentHash,
		Profile:         prof.Name,
		Samples:         S,
		Seed:            seed,
		TopK:            k,
		GOARCH:          runtime.GOARCH,
		Targets:         []Target{},
		ProfileTOML:     prof.TOML(),
		Revision:        cat.Revision,
	}
	var ts []target
	ix := newCatIndex(cat)
	for i := range cat.Moons {
		m := &cat.Moons[i]
		star := ""
		if pl := ix.planets[schema.NameKey(m.Parent)]; pl != nil {
			star = pl.Parent
		}
		if !opt.Filter.match(m.Parent, star) {
			continue
		}
		p, err := buildPlan(ix, m, prof)
		if err != nil {
			res.Warnings = append(res.Warnings, fmt.Sprintf("%s (%s): %v; used as a fixed value", m.Name, m.Parent, err))
		}
		if len(p.missing) > 0 {
			res.Excluded = append(res.Excluded, Excluded{Name: m.Name, Planet: m.Parent, Missing: p.missing})
			res.Warnings = append(res.Warnings, fmt.Sprintf("%s (%s) not ranked: %v: %s (give them in the catalog or as profile priors)",
				m.Name, m.Parent, ErrMissingInputs, strings.Join(p.missing, ", ")))
			continue
		}
		ts = append(ts, target{moon: m, plan: p, star: star})
	}
	N := len(ts)
	if N == 0 {
		return res, nil
	}
	if int64(N)*int64(S) > MaxCells {
		return nil, fmt.Errorf("rank: %d targets × %d samples exceeds the limit of %d (the score matrix would need %.1f GiB); use fewer samples or a filter",
			N, S, MaxCells, float64(N)*float64(S)*4/(1<<30))
	}
	res.Targets = make([]Target, N)
	for i := range ts {
		ts[i].out = &res.Targets[i]
	}
	workers := opt.Workers
	if workers == 0 {
		workers = runtime.GOMAXPROCS(0)
	}
	workers = max(1, min(workers, N))

	// Phase 1: sample every target; keep only its composite scores.
	mat := make([]float32, N*S)
	var next atomic.Int64
	var mu sync.Mutex
	done := 0
	var wg sync.WaitGroup
	for range workers {
		wg.Add(1)
		go func() {
			defer wg.Done()
			w := newWorker(S, prof)
			for {
				i := int(next.Add(1) - 1)
				if i >= N || ctx.Err() != nil {
					return
				}
				w.run(&ts[i], seed, mat[i*S:(i+1)*S])
				if opt.Progress != nil {
					mu.Lock() // serialises the calls and keeps done increasing
					done++
					opt.Progress(done, N)
					mu.Unlock()
				}
			}
		}()
	}
	wg.Wait()
	if err := ctx.Err(); err != nil {
		return nil, err
	}

	// Phase 2: rank all targets in every sample, in place.
	ids := make([]uint64, N)
	for i, t := range ts {
		ids[i] = splitmix64(fnv1a(fnv1a(fnv1a(fnvOffset, schema.NameKey(t.moon.Parent)), "\x00"), schema.NameKey(t.moon.Name)))
	}
	rankSamples(mat, N, S, workers, seed, ids)

	// Phase 3: rank statistics per target.
	next.Store(0)
	for range workers {
		wg.Add(1)
		go func() {
			defer wg.Done()
			counts := make([]int32, N+1)
			for {
				i := int(next.Add(1) - 1)
				if i >= N {
					return
				}
				t := ts[i].out
				p05, p50, p95, top := stats.RankStats(mat[i*S:(i+1)*S], N, k, counts)
				t.Rank, t.RankP05, t.RankP95 = p50, p05, p95
				t.PTop = PTop{K: k, P: float64(top) / float64(S)}
			}
		}()
	}
	wg.Wait()

	sort.SliceStable(res.Targets, func(i, j int) bool {
		a, b := &res.Targets[i], &res.Targets[j]
		if a.Rank != b.Rank {
			return a.Rank < b.Rank
		}
		if a.Score.P50 != b.Score.P50 {
			return a.Score.P50 > b.Score.P50
		}
		if ka, kb := schema.NameKey(a.Name), schema.NameKey(b.Name); ka != kb {
			return ka < kb
		}
		return schema.NameKey(a.Planet) < schema.NameKey(b.Planet)
	})
	return res, nil
}

// rankBlock is the number of samples ranked together: their scores are
// gathered from every target's row into a tile, ranked column by column and
// written back, so the matrix is read and written in 256-byte runs.
const rankBlock = 64

// rankSamples ranks every sample's column of mat in place. Exactly equal
// scores (common where transfers clamp at 0 or 1) are ordered at random, by
// a hash of (seed, sample, moon identity), so that no moon gains from its
// place in the catalog; ranks stay a permutation in every sample.
func rankSamples(mat []float32, N, S, workers int, seed uint64, ids []uint64) {
	tieSeed := splitmix64(seed ^ 0x7469652d62726b) // "tie-brk"
	blocks := (S + rankBlock - 1) / rankBlock
	var next atomic.Int64
	var wg sync.WaitGroup
	for range min(workers, blocks) {
		wg.Add(1)
		go func() {
			defer wg.Done()
			tile := make([]float32, N*rankBlock)
			col := make([]float32, N)
			rk := make([]float32, N)
			var r stats.Ranker
			for {
				b := int(next.Add(1) - 1)
				if b >= blocks {
					return
				}
				j0 := b * rankBlock
				w := min(rankBlock, S-j0)
				for t := range N {
					copy(tile[t*w:(t+1)*w], mat[t*S+j0:t*S+j0+w])
				}
				for c := range w {
					jmix := uint64(j0+c) * 0x9e3779b97f4a7c15
					for t := range N {
						col[t] = tile[t*w+c]
					}
					r.RanksTies(col, func(t int) uint32 { return uint32(splitmix64(tieSeed^ids[t]^jmix) >> 32) }, rk)
					for t := range N {
						tile[t*w+c] = rk[t]
					}
				}
				for t := range N {
					copy(mat[t*S+j0:t*S+j0+w], tile[t*w:(t+1)*w])
				}
			}
		}()
	}
	wg.Wait()
}

// splitmix64 is the output function of Steele, Lea & Flood's SplitMix64
// (OOPSLA 2014), used to decorrelate generator seeds.
func splitmix64(x uint64) uint64 {
	x += 0x9e3779b97f4a7c15
	x = (x ^ (x >> 30)) * 0xbf58476d1ce4e5b9
	x = (x ^ (x >> 27)) * 0x94d049bb133111eb
	return x ^ (x >> 31)
}

// streamSeed returns the PCG seed of one (input stream, chunk) pair. The
// stream is a hash of the input's key and the identity (names) of the body
// that owns it, not of positions, so a moon's samples do not change when other
// moons are added or filtered out, and the moons of one planet or star share
// that body's draws sample by sample.
func streamSeed(seed, stream uint64, chunk int) (uint64, uint64) {
	x := splitmix64(seed)
	x = splitmix64(x ^ stream)
	x = splitmix64(x ^ uint64(chunk))
	return x, splitmix64(x ^ 0xda942042e4dd58b5)
}

// Contract metrics with per-sample buffers.
const (
	mTidalPower = iota
	mRadiogenicPower
	mHeatFlux
	mTidalForce
	mSurfaceTemperature
	mEscapeVelocity
	mWaterLayer
	mIceShell
	numBuffered
)

var bufferedNames = [numBuffered]string{
	"tidal_power_w", "radiogenic_power_w", "heat_flux_w_m2", "tidal_force_n",
	"surface_temperature_k", "escape_velocity_m_s", "water_layer_thickness_m", "ice_shell_thickness_m",
}

// worker holds one goroutine's buffers, reused from target to target, so the
// sample loop allocates nothing.
type worker struct {
	S         int
	prof      *profile.Profile
	need      physics.Need      // optional outputs the profile's criteria read
	src       *uncertain.Stream // math/rand/v2's PCG with inlined draws
	cols      [][]float64       // per slot, one chunk
	view      [][]float64       // per slot, all samples of a shared (planet or star) input
	chunkCols [][]float64       // per slot, this chunk's values
	roleCols  [numRoles][]float64
	nan       []float64 // ChunkSize NaNs: the column of an absent input
	shared    sharedCache
	metric    [numBuffered][]float64
	score     []float64
	acc       []*sensitivity.Accumulator
	uncertain []int
	classes   int
	sum       stats.Summarizer
	d         physics.Derived
	in        physics.Inputs
}

func newWorker(S int, prof *profile.Profile) *worker {
	w := &worker{S: S, prof: prof, need: prof.Needs(), score: make([]float64, S), classes: sensitivity.ClassCount(S)}
	w.src = uncertain.NewStream()
	w.nan = make([]float64, ChunkSize)
	for i := range w.nan {
		w.nan[i] = math.NaN()
	}
	for m := range w.metric {
		w.metric[m] = make([]float64, S)
	}
	return w
}

func (w *worker) run(t *target, seed uint64, row []float32) {
	p := t.plan
	S := w.S
	for len(w.cols) < len(p.slots) {
		w.cols = append(w.cols, make([]float64, ChunkSize))
		w.view = append(w.view, nil)
		w.acc = append(w.acc, sensitivity.NewAccumulator(sensitivity.Partition{M: 1, Lo: 0, Hi: 1}))
	}
	// A planet's or star's inputs are drawn once per worker for all samples
	// and reused by its other moons (same stream, so the same values).
	w.shared.columns(p, seed, S, w)
	// Sensitivity classes from each uncertain input's own distribution.
	uncertainSlots := w.uncertain[:0]
	for s, sl := range p.slots {
		if !sl.dist.Fixed() {
			uncertainSlots = append(uncertainSlots, s)
			w.acc[s].Reset(partition(sl.dist, w.classes))
		}
	}
	w.uncertain = uncertainSlots
	var ocean int
	var retained [physics.NumVolatiles]int
	var flagCount [32]int
	var scoreNaN int
	for c := 0; c*ChunkSize < S; c++ {
		g0 := c * ChunkSize
		n := min(ChunkSize, S-g0)
		for s, sl := range p.slots {
			if sl.shared {
				continue
			}
			w.src.Seed(streamSeed(seed, sl.stream, c))
			uncertain.FillFrom(sl.dist, w.src, w.cols[s][:n])
		}
		cols := w.chunkCols[:0]
		for s, sl := range p.slots {
			if sl.shared {
				cols = append(cols, w.view[s][g0:g0+n])
			} else {
				cols = append(cols, w.cols[s][:n])
			}
		}
		w.chunkCols = cols
		// Chunk-local views, so the loop body indexes without reloading
		// slice headers or re-checking bounds against S.
		tp, rp, hf := w.metric[mTidalPower][g0:g0+n], w.metric[mRadiogenicPower][g0:g0+n], w.metric[mHeatFlux][g0:g0+n]
		tf, st, ev := w.metric[mTidalForce][g0:g0+n], w.metric[mSurfaceTemperature][g0:g0+n], w.metric[mEscapeVelocity][g0:g0+n]
		wl, is := w.metric[mWaterLayer][g0:g0+n], w.metric[mIceShell][g0:g0+n]
		scs, rws := w.score[g0:g0+n], row[g0:g0+n]
		in, d, model, prof, need := &w.in, &w.d, &w.prof.Model, w.prof, w.need
		p.roleColumns(cols, w.nan, n, &w.roleCols)
		rc := &w.roleCols
		for i := range n {
			p.inputs(rc, i, in)
			physics.EvaluateSome(in, model, d, need)
			tp[i] = d.TidalPower
			rp[i] = d.RadiogenicPower
			hf[i] = d.HeatFlux
			tf[i] = d.TidalForce
			st[i] = d.SurfaceTemperature
			ev[i] = d.EscapeVelocity
			wl[i] = d.WaterLayerThickness
			is[i] = d.IceShellThickness
			ocean += b2i(d.OceanQualifies)
			for v, r := range d.Retained {
				retained[v] += b2i(r)
			}
			for f := d.Flags; f != 0; f &= f - 1 {
				flagCount[bits.TrailingZeros32(uint32(f))]++
			}
			sc := prof.Score(d)
			if math.IsNaN(sc) {
				sc = 0
				scoreNaN++
			}
			scs[i] = sc
			rws[i] = float32(sc)
		}
		for _, s := range uncertainSlots {
			w.acc[s].AddAll(cols[s], w.score[g0:g0+n])
		}
	}

	out := t.out
	out.Name, out.Planet, out.Star = t.moon.Name, t.moon.Parent, t.star
	out.Inputs = p.params()
	assumed, priors := p.assumed()
	out.AssumedInputs, out.Priors = catalogKeys(assumed), priors

	// Drivers, from the score's mean and variance over all samples.
	var mean, vr float64
	for _, y := range w.score {
		mean += y
	}
	mean /= float64(S)
	for _, y := range w.score {
		vr += (y - mean) * (y - mean)
	}
	vr /= float64(S)
	if vr < 1e-24 { // round-off only: no uncertainty to apportion
		vr = 0
	}
	out.Drivers = make([]Driver, 0, len(uncertainSlots))
	for _, s := range uncertainSlots {
		out.Drivers = append(out.Drivers, Driver{Input: p.slots[s].key, Share: w.acc[s].Index(mean, vr)})
	}
	sort.SliceStable(out.Drivers, func(i, j int) bool {
		if out.Drivers[i].Share != out.Drivers[j].Share {
			return out.Drivers[i].Share > out.Drivers[j].Share
		}
		return out.Drivers[i].Input < out.Drivers[j].Input
	})

	sum := w.sum.Summarize(w.score, true)
	out.Score = Quantiles{P05: sum.P05, P50: sum.P50, P95: sum.P95}
	out.ScoreMedianSE = sum.MedianSE

	var notes []string
	q := func(m int) Quantiles {
		s := w.sum.Summarize(w.metric[m], false)
		if s.N < S {
			notes = append(notes, fmt.Sprintf("%s: not computable in %s of samples", bufferedNames[m], percent(S-s.N, S)))
		}
		if s.N == 0 {
			return Quantiles{}
		}
		return Quantiles{P05: s.P05, P50: s.P50, P95: s.P95}
	}
	mt := &out.Metrics
	mt.TidalPower = q(mTidalPower)
	mt.RadiogenicPower = q(mRadiogenicPower)
	mt.HeatFlux = q(mHeatFlux)
	mt.TidalForce = q(mTidalForce)
	mt.SurfaceTemperature = q(mSurfaceTemperature)
	mt.EscapeVelocity = q(mEscapeVelocity)
	mt.WaterLayerThickness = q(mWaterLayer)
	mt.IceShellThickness = q(mIceShell)
	mt.OceanProbability = float64(ocean) / float64(S)
	mt.OceanProbabilitySE = stats.BinomialSE(mt.OceanProbability, S)
	mt.Retention = make(map[string]float64, physics.NumVolatiles)
	for v, vol := range physics.Volatiles {
		mt.Retention[vol.Formula] = float64(retained[v]) / float64(S)
	}
	if scoreNaN > 0 {
		notes = append(notes, fmt.Sprintf("score: not computable in %s of samples (counted as 0)", percent(scoreNaN, S)))
	}
	out.Notes = notes
	out.Flags = nil
	for b, c := range flagCount {
		if c > 0 {
			if out.Flags == nil {
				out.Flags = map[string]float64{}
			}
			out.Flags[physics.Flag(1<<b).String()] = float64(c) / float64(S)
		}
	}
}

// catalogKeys keeps the keys of keys that the catalog can hold (those of
// schema.LookupKey's registry), in order. An assumed input is one of them
// only when the catalog lacked it for the target; a model parameter that only
// a profile sets (profile.RockDensityKey) is assumed for every target alike,
// so it would mark every target and tell a reviewer nothing.
func catalogKeys(keys []string) []string {
	out := make([]string, 0, len(keys))
	for _, k := range keys {
		if _, ok := schema.LookupKey(k); ok {
			out = append(out, k)
		}
	}
	return out
}

// sharedCache keeps the full sample columns of the planet and star inputs a
// worker drew last, so the next moon of the same planet or star reuses them.
type sharedCache struct {
	entries [8]sharedEntry
	next    int
}

type sharedEntry struct {
	key    string
	stream uint64
	param  schema.Param
	col    []float64
}

func (e *sharedEntry) holds(sl *slot) bool {
	return e.col != nil && e.stream == sl.stream && e.key == sl.key && e.param.Value == sl.param.Value &&
		e.param.Unc == sl.param.Unc && e.param.Status == sl.param.Status && e.param.Source == sl.param.Source
}

// columns sets w.view for every shared slot of p: a cached column when one
// holds that input, else a newly drawn one in an entry this target does not
// use (so filling one of its columns never overwrites another).
func (c *sharedCache) columns(p *plan, seed uint64, S int, w *worker) {
	var pinned uint
	for s := range p.slots {
		sl := &p.slots[s]
		w.view[s] = nil
		if !sl.shared {
			continue
		}
		for i := range c.entries {
			if c.entries[i].holds(sl) {
				w.view[s] = c.entries[i].col
				pinned |= 1 << i
				break
			}
		}
	}
	for s := range p.slots {
		sl := &p.slots[s]
		if !sl.shared || w.view[s] != nil {
			continue
		}
		for pinned&(1<<c.next) != 0 {
			c.next = (c.next + 1) % len(c.entries)
		}
		i := c.next
		c.next = (c.next + 1) % len(c.entries)
		pinned |= 1 << i
		e := &c.entries[i]
		if cap(e.col) < S {
			e.col = make([]float64, S)
		}
		e.col = e.col[:S]
		e.key, e.stream, e.param = sl.key, sl.stream, sl.param
		for ch := 0; ch*ChunkSize < S; ch++ {
			g0 := ch * ChunkSize
			w.src.Seed(streamSeed(seed, sl.stream, ch))
			uncertain.FillFrom(sl.dist, w.src, e.col[g0:min(S, g0+ChunkSize)])
		}
		w.view[s] = e.col
	}
}

// partition spans the 0.5 %–99.5 % quantiles of d with equal-width classes,
// on a log scale for the log-normal and log-uniform laws (whose classes of
// equal probability are of equal width in log x).
func partition(d uncertain.Dist, m int) sensitivity.Partition {
	p := sensitivity.Partition{M: m, Lo: d.Quantile(0.005), Hi: d.Quantile(0.995)}
	switch d.(type) {
	case *uncertain.LogNormal, uncertain.LogUniform:
		p.Log = p.Lo > 0
	case uncertain.Uniform:
		p.Lo, p.Hi = d.Quantile(0), d.Quantile(1)
	}
	return p
}

func b2i(b bool) int {
	if b {
		return 1
	}
	return 0
}

func percent(n, of int) string {
	return fmt.Sprintf("%.3g%%", 100*float64(n)/float64(of))
}
