//! Total intensity on a global grid at the reference sphere, and the surface-intensity low: the
//! minimum of F, its position, the area below a threshold and the separate minima below it.

use super::coefficients::{index, Coefficients};
use super::error::{check, FieldError, FieldResult};
use super::legendre::schmidt;
use super::synthesis::{spherical_components, REFERENCE_RADIUS_KM};
use crate::sphere::wrap360;

/// F on a cell-centred latitude–longitude grid at r = a (6371.2 km).
///
/// Cell (i, j) is centred at latitude −90 + (i + ½)·step and longitude (j + ½)·step.
#[derive(Debug, Clone, PartialEq)]
pub struct IntensityGrid {
    /// Cell size, degrees.
    pub step: f64,
    /// Rows (latitudes).
    pub nlat: usize,
    /// Columns (longitudes).
    pub nlon: usize,
    /// F in nT, row-major (row i = latitude i, south to north).
    pub f: Vec<f64>,
}

impl IntensityGrid {
    /// Latitude of row `i`, degrees.
    pub fn lat(&self, i: usize) -> f64 {
        -90.0 + (i as f64 + 0.5) * self.step
    }
    /// Longitude of column `j`, degrees.
    pub fn lon(&self, j: usize) -> f64 {
        (j as f64 + 0.5) * self.step
    }
    /// F at row `i`, column `j`.
    pub fn at(&self, i: usize, j: usize) -> f64 {
        self.f[i * self.nlon + j]
    }
    /// Area of a cell of row `i`, km²: a² Δλ (sin φ₂ − sin φ₁).
    pub fn cell_area(&self, i: usize) -> f64 {
        let (lo, hi) = ((self.lat(i) - self.step / 2.0).to_radians(), (self.lat(i) + self.step / 2.0).to_radians());
        REFERENCE_RADIUS_KM.powi(2) * self.step.to_radians() * (hi.sin() - lo.sin())
    }
}

/// Total intensity on a global grid at the reference sphere.
///
/// # Units
/// `step` in degrees; it must divide 180 (0.1 ≤ step ≤ 10). F in nT.
///
/// # Formula
/// The synthesis of [`spherical_components`] at r = a, arranged for a grid: per latitude the sums over
/// degree are formed once per order m, then each longitude needs only Σ_m (A_m cos mφ + B_m sin mφ).
pub fn intensity_grid(c: &Coefficients, step: f64) -> FieldResult<IntensityGrid> {
    check("grid step", step, 0.1, 10.0, "[0.1, 10] degrees")?;
    let nlat = (180.0 / step).round() as usize;
    if (nlat as f64 * step - 180.0).abs() > 1e-9 {
        return Err(FieldError::OutOfRange { name: "grid step", value: step, range: "a divisor of 180 degrees" });
    }
    let nlon = 2 * nlat;
    let nm = c.degree + 1;
    let mut trig = vec![(0.0, 0.0); nlon * nm];
    for j in 0..nlon {
        let phi = ((j as f64 + 0.5) * step).to_radians();
        for m in 0..nm {
            trig[j * nm + m] = (m as f64 * phi).sin_cos();
        }
    }
    let mut grid = IntensityGrid { step, nlat, nlon, f: vec![0.0; nlat * nlon] };
    let (mut p, mut dp) = (Vec::new(), Vec::new());
    let mut sums = vec![[0.0f64; 6]; nm];
    for i in 0..nlat {
        let theta = (90.0 - grid.lat(i)).to_radians();
        schmidt(theta, c.degree, &mut p, &mut dp);
        let inv_s = 1.0 / theta.sin();
        for (m, s) in sums.iter_mut().enumerate() {
            *s = [0.0; 6];
            for n in m.max(1)..=c.degree {
                let k = index(n, m);
                let (g, h, n1) = (c.g[k], c.h[k], n as f64 + 1.0);
                s[0] += n1 * g * p[k];
                s[1] += n1 * h * p[k];
                s[2] -= g * dp[k];
                s[3] -= h * dp[k];
                s[4] += m as f64 * g * p[k] * inv_s;
                s[5] += m as f64 * h * p[k] * inv_s;
            }
        }
        for j in 0..nlon {
            let (mut br, mut bt, mut bp) = (0.0, 0.0, 0.0);
            for (s, &(sm, cm)) in sums.iter().zip(&trig[j * nm..(j + 1) * nm]) {
                br += s[0] * cm + s[1] * sm;
                bt += s[2] * cm + s[3] * sm;
                bp += s[4] * sm - s[5] * cm;
            }
            grid.f[i * nlon + j] = (br * br + bt * bt + bp * bp).sqrt();
        }
    }
    Ok(grid)
}

/// F at the reference sphere at a geocentric latitude and longitude (degrees).
pub fn surface_intensity(c: &Coefficients, lat: f64, lon: f64) -> f64 {
    let (br, bt, bp) = spherical_components(c, REFERENCE_RADIUS_KM, (90.0 - lat).to_radians(), lon.to_radians());
    (br * br + bt * bt + bp * bp).sqrt()
}

/// A local minimum of F.
#[derive(Debug, Clone, Copy, PartialEq, serde::Serialize)]
pub struct IntensityMinimum {
    /// Geocentric latitude, degrees.
    pub lat: f64,
    /// Longitude, degrees, [0, 360).
    pub lon: f64,
    /// F there, nT.
    pub f: f64,
}

/// The surface-intensity low of one epoch.
#[derive(Debug, Clone, PartialEq, serde::Serialize)]
pub struct IntensityLow {
    /// The lowest F on the reference sphere, refined from the grid to 10⁻⁵°.
    pub minimum: IntensityMinimum,
    /// The threshold, nT.
    pub threshold: f64,
    /// Area of the grid cells with F below the threshold, km².
    pub area_km2: f64,
    /// Separate local minima of the grid below the threshold (refined), lowest first.
    pub minima: Vec<IntensityMinimum>,
}

/// The low of F on the reference sphere: its minimum, the area below `threshold` and its separate minima.
///
/// A grid cell is a separate minimum when F there is below the threshold and below all eight
/// neighbours (longitudes wrap around). Each one is refined by a pattern search (steps halved from half a
/// cell down to 10⁻⁵°).
pub fn intensity_low(c: &Coefficients, threshold: f64, step: f64) -> FieldResult<IntensityLow> {
    check("low threshold", threshold, 0.0, 1.0e6, "[0, 1e6] nT")?;
    let grid = intensity_grid(c, step)?;
    let mut area = 0.0;
    let mut cells = Vec::new();
    let mut best = (f64::INFINITY, 0, 0);
    for i in 0..grid.nlat {
        let cell = grid.cell_area(i);
        for j in 0..grid.nlon {
            let f = grid.at(i, j);
            if f < best.0 {
                best = (f, i, j);
            }
            if f < threshold {
                area += cell;
                if is_local_minimum(&grid, i, j) {
                    cells.push((i, j));
                }
            }
        }
    }
    let refine = |i: usize, j: usize| refine_minimum(c, grid.lat(i), grid.lon(j), step / 2.0);
    let minimum = refine(best.1, best.2);
    let mut minima: Vec<IntensityMinimum> = cells.iter().map(|&(i, j)| refine(i, j)).collect();
    minima.sort_by(|a, b| a.f.total_cmp(&b.f));
    Ok(IntensityLow { minimum, threshold, area_km2: area, minima })
}

fn is_local_minimum(g: &IntensityGrid, i: usize, j: usize) -> bool {
    let f = g.at(i, j);
    for di in -1i64..=1 {
        let ii = i as i64 + di;
        if ii < 0 || ii >= g.nlat as i64 {
            continue;
        }
        for dj in -1i64..=1 {
            if di == 0 && dj == 0 {
                continue;
            }
            let jj = (j as i64 + dj).rem_euclid(g.nlon as i64) as usize;
            if g.at(ii as usize, jj) <= f {
                return false;
            }
        }
    }
    true
}

/// Pattern search for the minimum of F near (lat, lon), first step `step` degrees.
fn refine_minimum(c: &Coefficients, lat: f64, lon: f64, step: f64) -> IntensityMinimum {
    let (mut lat, mut lon, mut step) = (lat, lon, step);
    let mut f = surface_intensity(c, lat, lon);
    let mut rounds = 0;
    while step > 1e-5 && rounds < 10_000 {
        rounds += 1;
        let mut moved = false;
        for (dl, dm) in
            [(1.0, 0.0), (-1.0, 0.0), (0.0, 1.0), (0.0, -1.0), (1.0, 1.0), (1.0, -1.0), (-1.0, 1.0), (-1.0, -1.0)]
        {
            let (la, lo) = ((lat + dl * step).clamp(-90.0, 90.0), lon + dm * step);
            let v = surface_intensity(c, la, lo);
            if v < f {
                (lat, lon, f, moved) = (la, lo, v, true);
            }
        }
        if !moved {
            step /= 2.0;
        }
    }
    IntensityMinimum { lat, lon: wrap360(lon), f }
}
