//! Gauss coefficients of one epoch, stored by degree and order.

/// Schmidt semi-normalised Gauss coefficients g_n^m, h_n^m of one epoch (or their yearly rates).
///
/// # Units
/// nT (nT/yr for a secular variation).
///
/// Stored packed: the entry of degree n, order m is at n(n+1)/2 + m (degree 0 is unused and zero).
#[derive(Debug, Clone, PartialEq)]
pub struct Coefficients {
    /// Highest degree.
    pub degree: usize,
    /// Cosine coefficients g_n^m, packed.
    pub g: Vec<f64>,
    /// Sine coefficients h_n^m, packed (zero for m = 0).
    pub h: Vec<f64>,
}

/// Packed index of degree `n`, order `m`.
#[inline]
pub fn index(n: usize, m: usize) -> usize {
    n * (n + 1) / 2 + m
}

impl Coefficients {
    /// All-zero coefficients up to `degree`.
    pub fn zeros(degree: usize) -> Self {
        let len = index(degree, degree) + 1;
        Self { degree, g: vec![0.0; len], h: vec![0.0; len] }
    }

    /// g_n^m (zero above the highest degree).
    pub fn g(&self, n: usize, m: usize) -> f64 {
        if n > self.degree {
            0.0
        } else {
            self.g[index(n, m)]
        }
    }

    /// h_n^m (zero above the highest degree).
    pub fn h(&self, n: usize, m: usize) -> f64 {
        if n > self.degree {
            0.0
        } else {
            self.h[index(n, m)]
        }
    }

    /// `self + t · other`, term by term, at the degree of `self` (terms of `other` above it are dropped,
    /// missing ones count as zero).
    pub fn add_scaled(&self, other: &Coefficients, t: f64) -> Coefficients {
        let mut out = self.clone();
        let len = out.g.len().min(other.g.len());
        for k in 0..len {
            out.g[k] += t * other.g[k];
            out.h[k] += t * other.h[k];
        }
        out
    }

    /// `(other − self) / span`: the yearly rate from `self` to `other`, at the larger degree.
    pub fn rate_to(&self, other: &Coefficients, span: f64) -> Coefficients {
        let degree = self.degree.max(other.degree);
        let mut out = Coefficients::zeros(degree);
        for n in 1..=degree {
            for m in 0..=n {
                let k = index(n, m);
                out.g[k] = (other.g(n, m) - self.g(n, m)) / span;
                out.h[k] = (other.h(n, m) - self.h(n, m)) / span;
            }
        }
        out
    }

    /// The degree-1 terms (g10, g11, h11).
    pub fn dipole_terms(&self) -> (f64, f64, f64) {
        (self.g(1, 0), self.g(1, 1), self.h(1, 1))
    }

    /// Lowes–Mauersberger spatial power spectrum at radius ratio a/r = 1 (the reference sphere).
    ///
    /// # Units
    /// nT² per degree; element `n − 1` is degree n.
    ///
    /// # Formula
    /// R_n = (n + 1) Σ_m [(g_n^m)² + (h_n^m)²], the mean square of the field of degree n over the sphere.
    ///
    /// # References
    /// Lowes, F. J. (1974), Spatial power spectrum of the main geomagnetic field, *Geophys. J. R. astr.
    /// Soc.* 36, 717–730; Mauersberger, P. (1956), *Gerlands Beitr. Geophys.* 65, 207–215.
    pub fn power_spectrum(&self) -> Vec<f64> {
        (1..=self.degree)
            .map(|n| {
                let s: f64 = (0..=n).map(|m| self.g(n, m).powi(2) + self.h(n, m).powi(2)).sum();
                (n as f64 + 1.0) * s
            })
            .collect()
    }
}
