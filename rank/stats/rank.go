package stats

import (
	"math"
	"slices"
)

// Ranker ranks float32 scores, highest first, reusing its buffers between
// calls. Ties are broken by index, lower first, so the ranks of n scores are
// always a permutation of 1…n. A Ranker is not safe for concurrent use.
type Ranker struct {
	keys, buf []uint64 // score keys and the radix sort's other buffer
	tmp, aux  []uint64 // a run of tied keys and its radix buffer
	count     [1 << 11]int32
}

// orderKey maps a float32 to a uint32 whose unsigned order is the float's
// order (negative floats have their bits inverted, positive ones their sign
// bit set), so an integer radix sort sorts floats.
func orderKey(f float32) uint32 {
	b := math.Float32bits(f)
	if b>>31 != 0 {
		return ^b
	}
	return b | 1<<31
}

// Ranks writes into ranks[i] the rank (1 = highest score) of scores[i]. No
// score may be NaN. It is an LSD radix sort on the descending order key in
// three 11-bit passes, stable, started from index order (Knuth, TAOCP vol. 3,
// §5.2.5); passes whose digit is the same for every key are skipped.
func (r *Ranker) Ranks(scores []float32, ranks []float32) {
	for pos, k := range r.sortScores(scores) {
		ranks[uint32(k)] = float32(pos + 1)
	}
}

// sortScores returns the keys (descending score order key) << 32 | index,
// sorted stably by score; the slice is r's and valid until the next call.
func (r *Ranker) sortScores(scores []float32) []uint64 {
	n := len(scores)
	if cap(r.keys) < n {
		r.keys = make([]uint64, n)
		r.buf = make([]uint64, n)
	}
	keys, tmp := r.keys[:n], r.buf[:n]
	for i, s := range scores {
		keys[i] = uint64(^orderKey(s))<<32 | uint64(i)
	}
	for shift := uint(32); shift < 64; shift += 11 {
		c := &r.count
		clear(c[:])
		for _, k := range keys {
			c[(k>>shift)&0x7ff]++
		}
		if int(c[(keys[0]>>shift)&0x7ff]) == n {
			continue
		}
		var sum int32
		for d := range c {
			v := c[d]
			c[d] = sum
			sum += v
		}
		for _, k := range keys {
			d := (k >> shift) & 0x7ff
			tmp[c[d]] = k
			c[d]++
		}
		keys, tmp = tmp, keys
	}
	return keys
}

// RankStats summarises one target's ranks over samples (integers in 1…n):
// type-7 5 %, 50 % and 95 % quantiles and the count of ranks ≤ k. counts is a
// scratch slice of length ≥ n+1, all zero on entry and left all zero.
func RankStats(ranks []float32, n, k int, counts []int32) (p05, p50, p95 float64, top int) {
	s := len(ranks)
	for _, r := range ranks {
		counts[int(r)]++
	}
	// Order statistic j (0-based) is the smallest rank whose cumulative count exceeds j.
	ps := [3]float64{0.05, 0.5, 0.95}
	var need [6]int
	for i, p := range ps {
		h := float64(s-1) * p
		lo := int(math.Floor(h))
		need[2*i] = lo
		need[2*i+1] = min(lo+1, s-1)
	}
	var val [6]float64
	cum, next := 0, 0
	for r := 1; r <= n && (next < 6 || r <= k); r++ {
		c := int(counts[r])
		cum += c
		if r <= k {
			top += c
		}
		for next < 6 && need[next] < cum {
			val[next] = float64(r)
			next++
		}
	}
	q := func(i int, p float64) float64 {
		h := float64(s-1) * p
		f := h - math.Floor(h)
		return val[2*i] + f*(val[2*i+1]-val[2*i])
	}
	p05, p50, p95 = q(0, 0.05), q(1, 0.5), q(2, 0.95)
	for _, r := range ranks {
		counts[int(r)] = 0
	}
	return
}

// RanksTies is Ranks with ties between equal scores broken by tie(i) (lower
// first) instead of by index; equal (score, tie) pairs fall back to index
// order. With random tie values, tied scores get their ranks in random order,
// so no element gains from its position. The scores are radix-sorted as in
// Ranks; then each run of equal scores is re-sorted by tie value, so tie is
// called only for elements that are tied.
func (r *Ranker) RanksTies(scores []float32, tie func(i int) uint32, ranks []float32) {
	n := len(scores)
	keys := r.sortScores(scores)
	if cap(r.tmp) < n {
		r.tmp = make([]uint64, n)
	}
	for a := 0; a < n; {
		b := a + 1
		for b < n && keys[b]>>32 == keys[a]>>32 {
			b++
		}
		if b-a > 1 {
			run := r.tmp[:b-a]
			for j, k := range keys[a:b] {
				i := uint32(k)
				run[j] = uint64(tie(int(i)))<<32 | uint64(i)
			}
			if len(run) <= 64 {
				slices.Sort(run)
			} else {
				r.radix32(run)
			}
			for j, k := range run {
				keys[a+j] = keys[a+j]&^0xffffffff | k&0xffffffff
			}
		}
		a = b
	}
	for pos, k := range keys {
		ranks[uint32(k)] = float32(pos + 1)
	}
}

// radix32 sorts keys by their high 32 bits, stably, in three 11-bit passes.
func (r *Ranker) radix32(keys []uint64) {
	n := len(keys)
	if cap(r.aux) < n {
		r.aux = make([]uint64, n)
	}
	src, dst := keys, r.aux[:n]
	passes := 0
	for shift := uint(32); shift < 64; shift += 11 {
		c := &r.count
		clear(c[:])
		for _, k := range src {
			c[(k>>shift)&0x7ff]++
		}
		var sum int32
		for d := range c {
			v := c[d]
			c[d] = sum
			sum += v
		}
		for _, k := range src {
			d := (k >> shift) & 0x7ff
			dst[c[d]] = k
			c[d]++
		}
		src, dst = dst, src
		passes++
	}
	if passes%2 == 1 {
		copy(keys, src)
	}
}
