package physics

import "math"

// InteriorModel says which interior model produced a Derived's water layer.
type InteriorModel uint8

// Interior models.
const (
	InteriorNone         InteriorModel = iota // not computed (missing mass or radius)
	InteriorTwoComponent                      // ice–rock mixture from bulk density (RockFraction)
	InteriorThreeLayer                        // core–mantle–H₂O from mass and C/MR² (SolveThreeLayer)
)

// String returns "none", "two_component" or "three_layer".
func (m InteriorModel) String() string {
	switch m {
	case InteriorTwoComponent:
		return "two_component"
	case InteriorThreeLayer:
		return "three_layer"
	}
	return "none"
}

// BulkDensity returns the mean density 3m / (4πR³) in kg/m³ of a sphere of
// mass m (kg) and radius R (m). Invalid inputs give NaN.
func BulkDensity(mass, radius float64) float64 {
	if !(mass > 0) || !(radius > 0) {
		return nan
	}
	return 3 * mass / (4 * math.Pi * radius * radius * radius)
}

// RockFraction returns the rock mass fraction f of a two-component ice–rock
// body of bulk density rho (kg/m³), with end-member densities rockDensity and
// iceDensity (kg/m³), from volume additivity 1/ρ = f/ρ_r + (1−f)/ρ_i:
//
//	f = ρ_r (ρ − ρ_i) / (ρ (ρ_r − ρ_i))
//
// (the standard ice–rock mixing relation, e.g. Lupo & Lewis 1979, Icarus 40,
// 157; Schubert et al. 2004 in Jupiter: The Planet, Satellites and
// Magnetosphere, CUP). No self-compression and no porosity: a real body's rock
// is denser at depth, so f is an upper bound for a given rock density. A bulk
// density below ρ_i returns 0 with FlagDensityBelowIce, one above ρ_r returns 1
// with FlagDensityAboveRock. rockDensity must exceed iceDensity; otherwise the
// result is NaN with FlagOutOfDomain.
func RockFraction(rho, rockDensity, iceDensity float64) (float64, Flag) {
	if !(rho > 0) || !(iceDensity > 0) || !(rockDensity > iceDensity) || math.IsInf(rho, 0) || math.IsInf(rockDensity, 0) {
		return nan, FlagOutOfDomain
	}
	if rho <= iceDensity {
		if rho < iceDensity {
			return 0, FlagDensityBelowIce
		}
		return 0, 0
	}
	if rho >= rockDensity {
		if rho > rockDensity {
			return 1, FlagDensityAboveRock
		}
		return 1, 0
	}
	return rockDensity * (rho - iceDensity) / (rho * (rockDensity - iceDensity)), 0
}

// MixtureDensity returns the bulk density in kg/m³ of an ice–rock mixture of
// rock mass fraction f: 1 / (f/ρ_r + (1−f)/ρ_i), the inverse of RockFraction.
func MixtureDensity(f, rockDensity, iceDensity float64) float64 {
	if !(f >= 0 && f <= 1) || !(rockDensity > 0) || !(iceDensity > 0) {
		return nan
	}
	return 1 / (f/rockDensity + (1-f)/iceDensity)
}

// TwoComponentWaterLayer returns the H₂O layer thickness in m of a fully
// differentiated body of radius R (m) and bulk density rho (kg/m³) whose rock
// (mass fraction f, density rockDensity) has settled into a central core:
// D_w = R − r_rock with r_rock = R (f ρ / ρ_r)^⅓. No self-compression; the
// volume of each component is conserved on differentiation. Invalid inputs
// give NaN.
func TwoComponentWaterLayer(radius, rho, f, rockDensity float64) float64 {
	if !(radius > 0) || !(rho > 0) || !(f >= 0 && f <= 1) || !(rockDensity > 0) {
		return nan
	}
	v := f * rho / rockDensity
	if v >= 1 {
		return 0
	}
	return radius * (1 - math.Cbrt(v))
}

// ThreeLayer is a solution of the three-layer interior model.
type ThreeLayer struct {
	CoreRadius     float64 // m, metal core
	MantleRadius   float64 // m, outer radius of the rock mantle
	WaterThickness float64 // m, H₂O layer: radius − MantleRadius
	RockFraction   float64 // mass fraction of core + mantle
}

// ThreeLayerForward returns the bulk density (kg/m³) and normalised moment of
// inertia C/MR² of a sphere of radius R (m) made of a core of radius rc and
// density rhoCore, a mantle out to rm of density rhoMantle and an H₂O layer
// out to R of density rhoWater (uniform layers, no self-compression):
//
//	ρ̄ = ρ_w + (ρ_m − ρ_w) y³ + (ρ_c − ρ_m) x³
//	C/MR² = (2/5) [ρ_w + (ρ_m − ρ_w) y⁵ + (ρ_c − ρ_m) x⁵] / ρ̄
//
// with x = rc/R, y = rm/R. It is the forward model that SolveThreeLayer
// inverts. Invalid radii give NaN.
func ThreeLayerForward(radius, rc, rm, rhoCore, rhoMantle, rhoWater float64) (density, moi float64) {
	if !(radius > 0) || !(rc >= 0) || !(rm >= rc) || !(rm <= radius) {
		return nan, nan
	}
	x, y := rc/radius, rm/radius
	x3, y3 := x*x*x, y*y*y
	density = rhoWater + (rhoMantle-rhoWater)*y3 + (rhoCore-rhoMantle)*x3
	moi = 0.4 * (rhoWater + (rhoMantle-rhoWater)*y3*y*y + (rhoCore-rhoMantle)*x3*x*x) / density
	return density, moi
}

// SolveThreeLayer solves the three-layer interior model (metal core, rock
// mantle, H₂O layer, each of uniform, given density) for the core and mantle
// radii that reproduce a body's bulk density rho (kg/m³) and normalised moment
// of inertia moi = C/MR², the standard approach of interior studies of the
// Galilean satellites (Anderson et al. 1996, Nature 384, 541; Anderson et al.
// 1998, Science 281, 2019; Schubert et al. 2004 in Jupiter: The Planet,
// Satellites and Magnetosphere, CUP). The moment of inertia itself is usually
// derived from the degree-2 gravity field under the assumption of hydrostatic
// equilibrium (Radau–Darwin), which this model inherits.
//
// With the densities fixed, mass conservation ties the core radius to the
// mantle radius, and the moment of inertia increases monotonically with the
// mantle radius along that curve, so the solution is unique when it exists; it
// is found by a safeguarded Newton iteration. ok is false when no physical
// solution exists: a bulk density at or below the H₂O density or above the
// core density, layer densities not ordered ρ_w < ρ_m < ρ_c, or a moment of
// inertia outside the range the model can reach (a body more centrally
// condensed than a bare core under water, or less condensed than a water-free
// core and mantle). Radius in m.
func SolveThreeLayer(radius, rho, moi, rhoCore, rhoMantle, rhoWater float64) (sol ThreeLayer, ok bool) {
	bad := ThreeLayer{nan, nan, nan, nan}
	a, b := rhoMantle-rhoWater, rhoCore-rhoMantle
	if !(radius > 0) || !(rho > 0) || !(moi > 0) || !(rhoWater >= 0) || !(a > 0) || !(b > 0) ||
		math.IsInf(radius, 0) || math.IsInf(rho, 0) || math.IsInf(rhoCore, 0) {
		return bad, false
	}
	cA := rho - rhoWater
	cB := 2.5*moi*rho - rhoWater
	if !(cA > 0) {
		return bad, false
	}
	// Bracket the mantle radius y between x = y (no mantle) and the smaller
	// of y = 1 (no water) and x = 0 (no core); the residuals at the ends
	// follow in closed form.
	u := cA / (a + b)
	if u > 1 {
		return bad, false // denser than the core
	}
	lo := math.Cbrt(u)
	glo := (a+b)*u*lo*lo - cB
	hi, ghi := 1.0, 0.0
	if t := cA / a; t < 1 {
		hi = math.Cbrt(t) // x = 0: no core
		ghi = a*t*hi*hi - cB
	} else {
		x3 := (cA - a) / b // y = 1: no water
		x := math.Cbrt(x3)
		ghi = a + b*x3*x*x - cB
	}
	// Rounding can put a solution that lies on an edge (no core, no mantle,
	// no water) a hair outside the bracket: accept it within 1e-12 of the
	// density scale.
	tol := 1e-12 * (a + b + math.Abs(cB))
	switch {
	case glo > tol || ghi < -tol:
		return bad, false
	case ghi <= 0:
		x := 0.0
		if hi == 1 {
			x = math.Cbrt(math.Max(0, (cA-a)/b))
		}
		return threeLayerSolution(radius, rho, rhoWater, x, hi), true
	case glo >= 0:
		return threeLayerSolution(radius, rho, rhoWater, lo, lo), true
	}
	y := hi
	if ghi != glo {
		y = hi - ghi*(hi-lo)/(ghi-glo)
	}
	var x float64
	prev := math.Inf(1)
	for range 100 {
		g, dg, xx := threeLayerResidual(y, a, b, cA, cB, x)
		x = xx
		if g == 0 {
			break
		}
		if g > 0 {
			hi = y
		} else {
			lo = y
		}
		step := g / dg
		next := y - step
		as := math.Abs(step)
		if (as <= 1e-13 || (as <= 1e-8 && as <= 1e-4*prev)) && next >= lo && next <= hi {
			// Newton converging quadratically (each step much smaller than
			// the last): after a step this small the error is of order
			// 1e-16, far below a millimetre on a moon. Near a vanishing
			// core the convergence is slower, hence the second test.
			// Move x along the mass curve to first order, dx/dy = −a y²/(b x²),
			// when that move is small enough for the second-order term
			// (relative (dx/x)²) to vanish; otherwise recompute it.
			if dx := a * y * y / (b * x * x) * step; x > 0 && math.Abs(dx) <= 1e-6*x {
				x += dx
			} else {
				x = math.Cbrt(math.Max(0, (cA-a*next*next*next)/b))
			}
			y = next
			return threeLayerSolution(radius, rho, rhoWater, x, y), true
		}
		prev = as
		if !(next > lo && next < hi) {
			next = 0.5 * (lo + hi)
			prev = math.Inf(1)
		}
		if hi-lo <= 1e-14 {
			break
		}
		y = next
	}
	_, _, x = threeLayerResidual(y, a, b, cA, cB, x)
	return threeLayerSolution(radius, rho, rhoWater, x, y), true
}

func threeLayerSolution(radius, rho, rhoWater, x, y float64) ThreeLayer {
	return ThreeLayer{
		CoreRadius:     x * radius,
		MantleRadius:   y * radius,
		WaterThickness: (1 - y) * radius,
		RockFraction:   1 - rhoWater*(1-y*y*y)/rho,
	}
}

// threeLayerResidual returns g(y) = a y⁵ + b x⁵ − B, its derivative along the
// mass-conserving curve x³ = (A − a y³)/b, dg/dy = 5 a y² (y² − x²), and x.
// hint is an estimate of x (0 for none): two Newton steps from it replace
// the cube root when they reach full precision, which they do once the outer
// iteration has nearly converged.
func threeLayerResidual(y, a, b, cA, cB, hint float64) (g, dg, x float64) {
	y2 := y * y
	y3 := y2 * y
	x3 := (cA - a*y3) / b
	if x3 < 0 {
		x3 = 0
	}
	x = cubeRoot(x3, hint)
	g = a*y3*y2 + b*x3*x*x - cB
	dg = 5 * a * y2 * (y2 - x*x)
	return g, dg, x
}

// cubeRoot returns ∛t for t ≥ 0, refining hint by Newton's method when hint is
// within a few percent, and calling math.Cbrt otherwise.
func cubeRoot(t, hint float64) float64 {
	if hint > 1e-3 && t > 0 {
		x := hint
		x -= (x*x*x - t) / (3 * x * x)
		x -= (x*x*x - t) / (3 * x * x)
		if r := x*x*x - t; math.Abs(r) <= 4e-16*t {
			return x
		}
	}
	return math.Cbrt(t)
}
