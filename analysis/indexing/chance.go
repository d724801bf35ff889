package indexing

import (
	"fmt"
	"hash/fnv"
	"math"
	"math/rand/v2"
	"runtime"
	"sort"
	"strings"
	"sync"
)

// Sizes of the random-list calibration: every chance first uses the first
// nullSmall lists; a chance near the decision threshold uses nullLarge.
const (
	nullSmall = 256
	nullLarge = 1024
	// Empirical fractions are used when at least this many random lists
	// scored as well; beyond that an exponential tail is fitted.
	minExceed = 8
	// Fewest random lists with any solution for a tail to be fitted.
	minTail = 16
	// Most random lists the exponential tail is fitted to: a quarter of
	// those with a solution, at most this many, so that the threshold moves
	// into the tail as more lists are drawn.
	tailPoints = 64
	// Buckets of the 2θ range of the random lists, degrees.
	rangeBucketDeg = 5
)

// nullKey identifies one null distribution: a model, a peak count, a 2θ
// range bucket and the settings that change the score.
type nullKey struct {
	model   string
	n       int
	lo, hi  int   // 2θ range, degrees
	lambda  int64 // wavelength, 1e-6 Å
	tol     int64 // tolerance, 1e-6 degrees
	maxZero int64 // zero-shift limit, 1e-6 degrees
	set     decoySet
}

// list returns the i-th list of the key's null distribution: uniform
// random peaks, or a structured decoy (nil when the decoy drew too few
// lines).
func (k nullKey) list(i int) []Peak {
	if k.set == noDecoys {
		return randomPeaks(k, i)
	}
	return decoyPeaks(k, k.set, i)
}

// score returns the model's best score on the key's i-th list (0 when it
// finds nothing).
func (k nullKey) score(m *model, cfg searchConfig, i int) float64 {
	peaks := k.list(i)
	if len(peaks) < 3 {
		return 0
	}
	if sol, ok := m.search(peaks, cfg); ok {
		return sol.score
	}
	return 0
}

func (k nullKey) seed() uint64 {
	h := fnv.New64a()
	fmt.Fprintf(h, "%+v", k)
	return h.Sum64()
}

// nullDist holds the best scores of random lists, in generation order, and
// sorted copies of the first nullSmall and nullLarge of them.
type nullDist struct {
	mu     sync.Mutex
	scores []float64
	sorted map[int][]float64 // size -> scores sorted descending
	// unverified marks scores loaded from a calibration snapshot that have
	// not yet been checked (see LoadCalibration).
	unverified bool
}

var nullCache sync.Map // nullKey -> *nullDist

// rangeBucket widens the peaks' 2θ range to whole buckets.
func rangeBucket(peaks []Peak) (lo, hi int) {
	min, max := peaks[0].TwoThetaDeg, peaks[0].TwoThetaDeg
	for _, p := range peaks {
		min = math.Min(min, p.TwoThetaDeg)
		max = math.Max(max, p.TwoThetaDeg)
	}
	lo = int(math.Floor(min/rangeBucketDeg)) * rangeBucketDeg
	hi = int(math.Ceil(max/rangeBucketDeg)) * rangeBucketDeg
	if hi <= lo {
		hi = lo + rangeBucketDeg
	}
	if hi > 180 {
		hi = 180
	}
	return lo, hi
}

// randomPeaks draws the i-th random list of a null distribution: n peaks
// uniform in 2θ over [lo, hi] with uniform intensities, sorted by 2θ.
func randomPeaks(key nullKey, i int) []Peak {
	rng := rand.New(rand.NewPCG(key.seed(), uint64(i)))
	peaks := make([]Peak, key.n)
	for j := range peaks {
		peaks[j] = Peak{
			TwoThetaDeg: float64(key.lo) + rng.Float64()*float64(key.hi-key.lo),
			Intensity:   1 + 99*rng.Float64(),
		}
	}
	sort.Slice(peaks, func(a, b int) bool { return peaks[a].TwoThetaDeg < peaks[b].TwoThetaDeg })
	return peaks
}

// nullScores returns the best scores of the first size random lists for
// the model, sorted descending, computing and caching what is missing.
func nullScores(m *model, key nullKey, cfg searchConfig, size int) []float64 {
	v, _ := nullCache.LoadOrStore(key, &nullDist{sorted: map[int][]float64{}})
	d := v.(*nullDist)
	d.mu.Lock()
	defer d.mu.Unlock()
	d.verify(m, key, cfg)
	if s, ok := d.sorted[size]; ok {
		return s
	}
	start := len(d.scores)
	if start < size {
		d.scores = append(d.scores, make([]float64, size-start)...)
	}
	workers := runtime.GOMAXPROCS(0)
	var wg sync.WaitGroup
	for w := 0; w < workers; w++ {
		wg.Add(1)
		go func(w int) {
			defer wg.Done()
			for i := start + w; i < size; i += workers {
				d.scores[i] = key.score(m, cfg, i)
			}
		}(w)
	}
	wg.Wait()
	s := append([]float64(nil), d.scores[:size]...)
	sort.Sort(sort.Reverse(sort.Float64Slice(s)))
	d.sorted[size] = s
	return s
}

// tailChance estimates P(S_null ≥ s) from null scores sorted descending:
// the empirical fraction when at least minExceed lists reach s, otherwise
// an exponential tail fitted to the best of the lists that found any
// solution at all (score > 0),
//
//	P(S ≥ s) ≈ (k/K) · exp(−(s − u)/θ),  u = k-th largest score, θ = mean excess over u
//
// with K lists in all, K₊ of them positive and k = min(K₊/4, tailPoints). With fewer than
// minTail positive lists there is no tail to fit and the estimate is
// (exceedances + 1)/(K + 1), or, for decoys (floorless), exceedances/K:
// a decoy set that no list of which reaches s says nothing against s, and
// the uniform lists' estimate governs.
//
// Reference: common practice (peaks-over-threshold tail estimate).
func tailChance(null []float64, s float64, floorless bool) (float64, string) {
	k := len(null)
	exceed := sort.Search(k, func(i int) bool { return null[i] < s })
	if exceed >= minExceed {
		return float64(exceed) / float64(k), fmt.Sprintf("%d of %d random lists scored as well", exceed, k)
	}
	positive := sort.Search(k, func(i int) bool { return null[i] <= 0 })
	if positive < minTail {
		if floorless {
			return float64(exceed) / float64(k), fmt.Sprintf("%d of %d random lists scored as well", exceed, k)
		}
		return float64(exceed+1) / float64(k+1), fmt.Sprintf("%d of %d random lists scored as well", exceed, k)
	}
	top := min(positive/4, tailPoints)
	u := null[top]
	var mean float64
	for _, v := range null[:top] {
		mean += v - u
	}
	mean /= float64(top)
	basis := fmt.Sprintf("%d of %d random lists scored as well; exponential tail fitted to the best %d", exceed, k, top)
	if mean <= 0 {
		return float64(exceed+1) / float64(k+1), basis
	}
	c := float64(top) / float64(k) * math.Exp(-(s-u)/mean)
	return math.Min(c, 1), basis
}

// chance returns the probability that a random list scores at least s
// with the model, for lists like peaks: the larger of the estimates from
// uniform random lists and from the model's structured decoys. When refine
// is true and an estimate lies near threshold, it is made again from more
// lists.
//
// For a phase of known structure the uniform-list estimate is the
// analytic bound of fisherChance.
func chance(m *model, peaks []Peak, cfg searchConfig, s, threshold float64, refine bool) (float64, string) {
	var c float64
	var basis string
	if m.known != nil {
		c, basis = fisherChance(peaks, cfg, s)
	} else {
		c, basis = nullChance(m, peaks, cfg, s, threshold, refine, noDecoys, nullSmall, nullLarge)
	}
	if set := m.decoys(); set != noDecoys {
		cd, bd := nullChance(m, peaks, cfg, s, threshold, refine, set, decoySmall, decoyLarge)
		if cd > c {
			return cd, strings.ReplaceAll(bd, "random lists", "decoy patterns ("+string(set)+")")
		}
	}
	return c, basis
}

func nullChance(m *model, peaks []Peak, cfg searchConfig, s, threshold float64, refine bool, set decoySet, small, large int) (float64, string) {
	lo, hi := rangeBucket(peaks)
	key := nullKey{
		model:   m.id,
		n:       len(peaks),
		lo:      lo,
		hi:      hi,
		lambda:  int64(math.Round(cfg.lambda * 1e6)),
		tol:     int64(math.Round(cfg.tol * 1e6)),
		maxZero: int64(math.Round(cfg.maxZero * 1e6)),
		set:     set,
	}
	floorless := set != noDecoys
	c, basis := tailChance(nullScores(m, key, cfg, small), s, floorless)
	// A decoy estimate is coarser (fewer lists, each dearer), so it is
	// refined over a wider band.
	upper := threshold * 3
	if floorless {
		upper = threshold * 10
	}
	if refine && c > threshold/10 && c < upper {
		c, basis = tailChance(nullScores(m, key, cfg, large), s, floorless)
	}
	return c, basis
}

// sidak corrects a chance for the number of models of one kind tried:
// 1 − (1 − c)^k.
//
// Reference: Z. Šidák, J. Am. Stat. Assoc. 62, 626 (1967).
func sidak(c float64, k int) float64 {
	return -math.Expm1(float64(k) * math.Log1p(-c))
}
