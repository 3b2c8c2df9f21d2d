package circuits

import "math/cmplx"

// Reflection is what a directional wattmeter calibrated for the
// transmitter port's reference z reads for port voltage v and current i
// (into the network): Kurokawa's power waves with reference z*,
// a = (v + z*·i)/(2√Re z), b = (v − z·i)/(2√Re z), so |Γ| = |b/a| vanishes
// when the transmitter sees z, forward |a|² and reflected |b|², whose
// difference is Re(v·i*), the power entering the network.
func (c *Circuit) Reflection(v, i complex128) (gamma, fwd, refl float64) {
	z := c.Zin
	a, b := v+cmplx.Conj(z)*i, v-z*i
	rz := 4 * real(z)
	fwd, refl = abs2(a)/rz, abs2(b)/rz
	if fwd > 0 {
		gamma = cmplx.Abs(b) / cmplx.Abs(a)
	} else {
		gamma = 1
	}
	return
}
