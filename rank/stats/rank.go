package stats

import "math"

// Ranker ranks float32 scores, highest first, reusing its buffers between
// calls. Ties are broken by index, lower first, so the ranks of n scores are
// always a permutation of 1…n. A Ranker is not safe for concurrent use.
type Ranker struct {
	keys, tmp []uint64
	idx, itmp []uint32
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
	n := len(scores)
	if cap(r.keys) < n {
		r.keys = make([]uint64, n)
		r.tmp = make([]uint64, n)
	}
	keys, tmp := r.keys[:n], r.tmp[:n]
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
	for pos, k := range keys {
		ranks[uint32(k)] = float32(pos + 1)
	}
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

// RanksTies is Ranks with ties between equal scores broken by tie[i] (lower
// first) instead of by index; equal (score, tie) pairs fall back to index
// order. With tie values drawn at random, tied scores get their ranks in
// random order, so no element gains from its position. It is an LSD radix
// sort on the 64-bit key (descending score, tie), carrying the indices.
func (r *Ranker) RanksTies(scores []float32, tie []uint32, ranks []float32) {
	n := len(scores)
	if cap(r.keys) < n {
		r.keys, r.tmp = make([]uint64, n), make([]uint64, n)
	}
	if cap(r.idx) < n {
		r.idx, r.itmp = make([]uint32, n), make([]uint32, n)
	}
	keys, tmp := r.keys[:n], r.tmp[:n]
	idx, itmp := r.idx[:n], r.itmp[:n]
	for i, s := range scores {
		keys[i] = uint64(^orderKey(s))<<32 | uint64(tie[i])
		idx[i] = uint32(i)
	}
	for shift := uint(0); shift < 64; shift += 11 {
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
		for i, k := range keys {
			d := (k >> shift) & 0x7ff
			tmp[c[d]] = k
			itmp[c[d]] = idx[i]
			c[d]++
		}
		keys, tmp = tmp, keys
		idx, itmp = itmp, idx
	}
	for pos, i := range idx {
		ranks[i] = float32(pos + 1)
	}
}
