//! Logarithm and exponential from basic operations only (integer operations and correctly rounded
//! `+ − × ÷`), for one value and over slices. The slice versions are written so that the compiler
//! turns the loop into vector instructions; on x86-64 processors with AVX2 the same body is compiled a
//! second time for 256-bit registers and chosen at run time. No fused multiply–add is used, so both
//! paths give the same numbers, bit for bit, on every machine.
//!
//! Used by the Fisher sampler (`stats::fisher_lanes`) and the goodness-of-fit bootstrap of the renewal
//! models (`reversals::gof`).

/// 1.0.
pub(crate) const ONE_BITS: u64 = 0x3FF0_0000_0000_0000;
/// The 52 mantissa bits.
pub(crate) const MANTISSA: u64 = 0x000F_FFFF_FFFF_FFFF;
/// 2⁵² + exponent field, read as a double, minus 2⁵² gives the exponent field as a double.
pub(crate) const EXP_MAGIC_BITS: u64 = 0x4330_0000_0000_0000;
/// 2⁵².
pub(crate) const TWO52: f64 = 4_503_599_627_370_496.0;
/// ln 2 = LN2_HI + LN2_LO, LN2_HI with its low 32 bits zero so that e · LN2_HI is exact for |e| < 2²⁰
/// (the split of fdlibm's `e_log.c`, bit patterns 0x3fe62e42fee00000 and 0x3dea39ef35793c76).
#[allow(clippy::excessive_precision)]
pub(crate) const LN2_HI: f64 = 6.931_471_803_691_238_164_90e-1;
#[allow(clippy::excessive_precision)]
pub(crate) const LN2_LO: f64 = 1.908_214_929_270_587_700_02e-10;
/// Coefficients 1/(2k + 1), k = 0 … 11, of ln m = 2f Σ f²ᵏ/(2k + 1), f = (m − 1)/(m + 1).
pub(crate) const ATANH: [f64; 12] = [
    1.0,
    1.0 / 3.0,
    1.0 / 5.0,
    1.0 / 7.0,
    1.0 / 9.0,
    1.0 / 11.0,
    1.0 / 13.0,
    1.0 / 15.0,
    1.0 / 17.0,
    1.0 / 19.0,
    1.0 / 21.0,
    1.0 / 23.0,
];

/// Σₖ ATANH[k] zᵏ (k = 0 … 11) by Estrin's scheme (pairs, then pairs of pairs with z², z⁴, z⁸): a
/// chain of 5 dependent steps instead of Horner's 11, with the same operations on any number type.
#[inline(always)]
pub(crate) fn estrin<T: Copy>(z: T, c: impl Fn(usize) -> T, add: impl Fn(T, T) -> T, mul: impl Fn(T, T) -> T) -> T {
    let z2 = mul(z, z);
    let z4 = mul(z2, z2);
    let pair = |k: usize| add(c(k), mul(c(k + 1), z));
    let (p0, p1, p2, p3, p4, p5) = (pair(0), pair(2), pair(4), pair(6), pair(8), pair(10));
    let q0 = add(p0, mul(p1, z2));
    let q1 = add(p2, mul(p3, z2));
    let q2 = add(p4, mul(p5, z2));
    // Σ = q0 + z⁴ q1 + z⁸ q2 = q0 + z⁴ (q1 + z⁴ q2)
    add(q0, mul(z4, add(q1, mul(z4, q2))))
}

/// Natural logarithm of a positive normal number by basic operations only.
///
/// # Formula
/// w = m · 2ᵉ with m in [√½, √2); ln w = e ln 2 + 2 atanh f, f = (m − 1)/(m + 1), |f| ≤ 0.1716, the
/// series 2f Σ f²ᵏ/(2k + 1) cut after k = 11 (f²⁴/25 < 10⁻¹⁹), summed by [`estrin`]; ln 2 split in two parts so that e ln 2
/// is exact to rounding.
///
/// # References
/// Abramowitz, M. & Stegun, I. A. (1964), *Handbook of Mathematical Functions*, 4.1.27 (the series of
/// ln((1 + f)/(1 − f))); the split ln 2 after Tang, P. T. P. (1990), *ACM Trans. Math. Softw.* 16, 378.
#[inline(always)]
pub(crate) fn ln_basic(w: f64) -> f64 {
    let bits = w.to_bits();
    let e0 = f64::from_bits((bits >> 52) | EXP_MAGIC_BITS) - TWO52 - 1023.0;
    let m0 = f64::from_bits((bits & MANTISSA) | ONE_BITS);
    let big = m0 > std::f64::consts::SQRT_2;
    let m = if big { m0 * 0.5 } else { m0 };
    let e = if big { e0 + 1.0 } else { e0 };
    let f = (m - 1.0) / (m + 1.0);
    let f2 = f * f;
    let p = estrin(f2, |k| ATANH[k], |a, b| a + b, |a, b| a * b);
    e * LN2_HI + (2.0 * f * p + e * LN2_LO)
}

/// log₂ e.
const LOG2_E: f64 = std::f64::consts::LOG2_E;
/// 1.5 · 2⁵²: adding it rounds a number below 2⁵¹ in magnitude to an integer, which then sits in the
/// low mantissa bits of the sum.
const ROUND_MAGIC: f64 = 6_755_399_441_055_744.0;
/// Taylor coefficients 1/k!, k = 0 … 13, of eʳ.
const EXP_TAYLOR: [f64; 14] = [
    1.0,
    1.0,
    1.0 / 2.0,
    1.0 / 6.0,
    1.0 / 24.0,
    1.0 / 120.0,
    1.0 / 720.0,
    1.0 / 5040.0,
    1.0 / 40_320.0,
    1.0 / 362_880.0,
    1.0 / 3_628_800.0,
    1.0 / 39_916_800.0,
    1.0 / 479_001_600.0,
    1.0 / 6_227_020_800.0,
];

/// eˣ by basic operations only: 0 below x = −708 (where eˣ < 2.2 · 10⁻³⁰⁸, the smallest normal
/// number), +∞ above 709.78, NaN for NaN.
///
/// # Formula
/// x = k ln 2 + r with k = round(x / ln 2), |r| ≤ ½ ln 2, r computed with ln 2 split in two parts (k ·
/// LN2_HI exact); eʳ by its Taylor series to r¹³ (remainder below 5 · 10⁻¹⁸), Horner's scheme; 2ᵏ put
/// into the exponent field.
///
/// # References
/// Tang, P. T. P. (1989), Table-driven implementation of the exponential function in IEEE
/// floating-point arithmetic. *ACM Trans. Math. Softw.* 15, 144–157 (argument reduction); Abramowitz &
/// Stegun (1964), 4.2.1 (the series).
#[inline(always)]
pub(crate) fn exp_basic(x: f64) -> f64 {
    let xc = x.clamp(-708.0, 709.0);
    let t = xc * LOG2_E + ROUND_MAGIC;
    let k = t - ROUND_MAGIC;
    let r = (xc - k * LN2_HI) - k * LN2_LO;
    let mut p = EXP_TAYLOR[13];
    for c in EXP_TAYLOR[..13].iter().rev() {
        p = p * r + c;
    }
    // The low bits of t hold k (two's complement); k + 1023 shifted into the exponent field is 2ᵏ.
    let scale = f64::from_bits(t.to_bits().wrapping_add(1023) << 52);
    let v = p * scale;
    let v = if x > 709.78 { f64::INFINITY } else { v };
    let v = if x < -708.0 { 0.0 } else { v };
    if x.is_nan() {
        x
    } else {
        v
    }
}

/// `f()` compiled for AVX2 when the processor has it (the closure is inlined into a function with the
/// feature enabled; the same operations, so the same bits), else as it is.
#[inline(always)]
pub(crate) fn with_avx2<R, F: FnOnce() -> R>(f: F) -> R {
    #[cfg(target_arch = "x86_64")]
    if std::arch::is_x86_feature_detected!("avx2") {
        // SAFETY: the processor supports AVX2 (checked just above).
        return unsafe { run_avx2(f) };
    }
    f()
}

#[cfg(target_arch = "x86_64")]
#[target_feature(enable = "avx2")]
unsafe fn run_avx2<R, F: FnOnce() -> R>(f: F) -> R {
    f()
}

/// `out[i] = f(xs[i])` for a kernel `f` built from basic operations, compiled for AVX2 when the
/// processor has it (the same operations, so the same bits).
#[inline(always)]
pub(crate) fn map_into<F: Fn(f64) -> f64 + Copy>(xs: &[f64], out: &mut [f64], f: F) {
    assert_eq!(xs.len(), out.len(), "map_into: input and output lengths differ");
    #[cfg(target_arch = "x86_64")]
    if std::arch::is_x86_feature_detected!("avx2") {
        // SAFETY: the processor supports AVX2 (checked just above).
        return unsafe { map_avx2(xs, out, f) };
    }
    map_portable(xs, out, f)
}

#[inline(always)]
fn map_portable<F: Fn(f64) -> f64>(xs: &[f64], out: &mut [f64], f: F) {
    for (o, &x) in out.iter_mut().zip(xs) {
        *o = f(x);
    }
}

#[cfg(target_arch = "x86_64")]
#[target_feature(enable = "avx2")]
unsafe fn map_avx2<F: Fn(f64) -> f64>(xs: &[f64], out: &mut [f64], f: F) {
    map_portable(xs, out, f)
}

/// `xs[i] ← f(xs[i])` in place; see [`map_into`].
#[inline(always)]
pub(crate) fn map_in_place<F: Fn(f64) -> f64 + Copy>(xs: &mut [f64], f: F) {
    #[cfg(target_arch = "x86_64")]
    if std::arch::is_x86_feature_detected!("avx2") {
        // SAFETY: the processor supports AVX2 (checked just above).
        return unsafe { in_place_avx2(xs, f) };
    }
    in_place_portable(xs, f)
}

#[inline(always)]
fn in_place_portable<F: Fn(f64) -> f64>(xs: &mut [f64], f: F) {
    for x in xs.iter_mut() {
        *x = f(*x);
    }
}

#[cfg(target_arch = "x86_64")]
#[target_feature(enable = "avx2")]
unsafe fn in_place_avx2<F: Fn(f64) -> f64>(xs: &mut [f64], f: F) {
    in_place_portable(xs, f)
}

/// `a[i] ← f(a[i], b[i])` in place; see [`map_into`].
#[inline(always)]
pub(crate) fn map2_in_place<F: Fn(f64, f64) -> f64 + Copy>(a: &mut [f64], b: &[f64], f: F) {
    assert_eq!(a.len(), b.len(), "map2_in_place: lengths differ");
    #[cfg(target_arch = "x86_64")]
    if std::arch::is_x86_feature_detected!("avx2") {
        // SAFETY: the processor supports AVX2 (checked just above).
        return unsafe { map2_in_place_avx2(a, b, f) };
    }
    map2_in_place_portable(a, b, f)
}

#[inline(always)]
fn map2_in_place_portable<F: Fn(f64, f64) -> f64>(a: &mut [f64], b: &[f64], f: F) {
    for (x, &y) in a.iter_mut().zip(b) {
        *x = f(*x, y);
    }
}

#[cfg(target_arch = "x86_64")]
#[target_feature(enable = "avx2")]
unsafe fn map2_in_place_avx2<F: Fn(f64, f64) -> f64>(a: &mut [f64], b: &[f64], f: F) {
    map2_in_place_portable(a, b, f)
}

/// Natural logarithm of every element (positive finite inputs; subnormal ones are read as the
/// smallest normal number).
pub(crate) fn ln_into(xs: &[f64], out: &mut [f64]) {
    map_into(
        xs,
        out,
        #[inline(always)]
        |x| ln_basic(x.max(f64::MIN_POSITIVE)),
    )
}

/// eˣ of every element.
pub(crate) fn exp_into(xs: &[f64], out: &mut [f64]) {
    map_into(xs, out, exp_basic)
}

#[cfg(test)]
mod tests {
    use super::*;
    use crate::montecarlo::replicate_rng;
    use rand::RngExt;

    #[test]
    fn logarithm_matches_the_library_one() {
        assert_eq!((LN2_HI.to_bits(), LN2_LO.to_bits()), (0x3FE6_2E42_FEE0_0000, 0x3DEA_39EF_3579_3C76));
        assert_eq!(LN2_HI + LN2_LO, std::f64::consts::LN_2);
        // Against the system ln over (2⁻⁵², 1] and a few exact cases: within 3 units in the last place
        // of |ln w| (plus 1e-300 for w = 1).
        let mut rng = replicate_rng(4, 0, 0);
        for i in 0..200_000 {
            let w = if i % 2 == 0 { rng.random::<f64>() } else { (-(rng.random::<f64>() * 36.0)).exp() };
            if !(w > 0.0) {
                continue;
            }
            let (got, want) = (ln_basic(w), w.ln());
            assert!((got - want).abs() <= 3.0 * f64::EPSILON * want.abs() + 1e-300, "ln({w}) = {got}, library {want}");
        }
        assert_eq!(ln_basic(1.0), 0.0);
        assert!((ln_basic(0.5) + std::f64::consts::LN_2).abs() < 1e-16);
        assert!((ln_basic(2f64.powi(-52)) + 52.0 * std::f64::consts::LN_2).abs() < 1e-13);
    }

    #[test]
    fn exponential_matches_the_library_one() {
        // Against the system exp over [−708, 709]: within 2 units in the last place; the edges.
        let mut rng = replicate_rng(4, 1, 0);
        for i in 0..200_000 {
            let x = if i % 2 == 0 { rng.random::<f64>() * 1417.0 - 708.0 } else { rng.random::<f64>() * 4.0 - 2.0 };
            let (got, want) = (exp_basic(x), x.exp());
            assert!((got - want).abs() <= 2.0 * f64::EPSILON * want, "exp({x}) = {got}, library {want}");
        }
        assert_eq!(exp_basic(0.0), 1.0);
        assert_eq!(exp_basic(-800.0), 0.0);
        assert_eq!(exp_basic(710.0), f64::INFINITY);
        assert!(exp_basic(f64::NAN).is_nan());
        assert!((exp_basic(1.0) - std::f64::consts::E).abs() <= f64::EPSILON * 3.0);
    }

    #[test]
    fn slice_kernels_agree_with_the_scalar_ones_bit_for_bit() {
        // Whatever path the dispatch takes (AVX2 or portable), the slice results are the scalar ones.
        let mut rng = replicate_rng(4, 2, 0);
        let xs: Vec<f64> = (0..1003).map(|_| (rng.random::<f64>() * 60.0 - 30.0).exp()).collect();
        let mut out = vec![0.0; xs.len()];
        ln_into(&xs, &mut out);
        assert!(xs.iter().zip(&out).all(|(&x, &y)| y.to_bits() == ln_basic(x).to_bits()));
        let mut portable = vec![0.0; xs.len()];
        map_portable(&xs, &mut portable, |x| ln_basic(x.max(f64::MIN_POSITIVE)));
        assert_eq!(out, portable);
        let ys: Vec<f64> = out.iter().map(|v| v * 3.0).collect();
        exp_into(&ys, &mut out);
        assert!(ys.iter().zip(&out).all(|(&y, &e)| e.to_bits() == exp_basic(y).to_bits()));
        let mut inplace = ys.clone();
        map_in_place(&mut inplace, exp_basic);
        assert_eq!(inplace, out);
        // Two inputs in place, with a square root and a select (the inverse Gaussian sampler's shape).
        let g = |a: f64, b: f64| if b < 0.5 * a { (a * b).sqrt() - b / a } else { a / (1.0 + b) };
        let mut two = xs.clone();
        map2_in_place(&mut two, &ys, g);
        assert!(xs.iter().zip(&ys).zip(&two).all(|((&a, &b), &v)| v.to_bits() == g(a, b).to_bits()));
    }
}
