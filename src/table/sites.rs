//! The sites table: one site mean per row (`site, lat, lon, dec, inc`; optional `n, k, a95,
//! height`/`depth`).

use super::directions::strat_axis;
use super::reader::Table;
use crate::error::TableError;
use crate::model::{SiteRecord, SiteSet};
use crate::sphere::{Direction, GeoPoint};

/// Read a sites table.
///
/// Latitudes outside [−90, 90], inclinations outside [−90, 90], longitudes outside [−180, 360],
/// declinations outside [−360, 360], `n` that is not a whole number ≥ 1, `k` ≤ 0 and `a95` outside
/// (0, 180] are refused with the file, line and column.
pub fn read_sites(t: &Table) -> Result<SiteSet, TableError> {
    t.require_rows()?;
    let site = t.require("site")?;
    let (lat, lon) = (t.require("lat")?, t.require("lon")?);
    let (dec, inc) = (t.require("dec")?, t.require("inc")?);
    let (n_c, k_c, a_c) = (t.col("n"), t.col("k"), t.col("a95"));
    let axis = strat_axis(t)?;
    let mut records = Vec::with_capacity(t.rows.len());
    for row in &t.rows {
        let name = t.text(row, site).to_string();
        if name.is_empty() {
            return Err(t.error(row.line, Some("site"), "is empty; expected a site name"));
        }
        let la = t.number_in(row, lat, -90.0, 90.0)?;
        let lo = t.number_in(row, lon, -180.0, 360.0)?;
        let location = GeoPoint::new(la, lo).map_err(|e| t.error(row.line, Some("lat"), e.to_string()))?;
        let d = t.number_in(row, dec, -360.0, 360.0)?;
        let i = t.number_in(row, inc, -90.0, 90.0)?;
        let direction = Direction::new(d, i).map_err(|e| t.error(row.line, Some("dec"), e.to_string()))?;
        let n = match t.opt_number(row, n_c)? {
            None => None,
            Some(v) if v >= 1.0 && v.fract() == 0.0 && v < 1e9 => Some(v as usize),
            Some(v) => return Err(t.error(row.line, Some("n"), format!("{v} is not a whole number of at least 1"))),
        };
        let k = match t.opt_number(row, k_c)? {
            Some(v) if v <= 0.0 => return Err(t.error(row.line, Some("k"), format!("{v} is not positive"))),
            v => v,
        };
        let a95 = match t.opt_number(row, a_c)? {
            Some(v) if v <= 0.0 || v > 180.0 => {
                return Err(t.error(row.line, Some("a95"), format!("{v} is outside (0, 180]")))
            }
            v => v,
        };
        let position = match axis {
            Some((_, idx)) => t.opt_number(row, Some(idx))?,
            None => None,
        };
        records.push(SiteRecord { line: row.line, site: name, location, direction, n, k, a95, position });
    }
    Ok(SiteSet { source: t.name.clone(), axis: axis.map(|a| a.0), records })
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn reads_and_refuses() {
        let t = Table::parse(
            "s.csv",
            b"# sites\nSite,LAT,lon,dec,inc,n,k,a95\nA,41.5,-116,10,55,6,80,7.5\nB,0,359,190,-5,,,\n",
        )
        .unwrap();
        let s = read_sites(&t).unwrap();
        assert_eq!(s.records.len(), 2);
        assert_eq!(s.records[0].location.lon, 244.0);
        assert_eq!(s.records[0].n, Some(6));
        assert_eq!(s.records[1].k, None);
        assert_eq!(s.records[0].line, 3);
        let bad = Table::parse("s.csv", b"site,lat,lon,dec,inc\nA,91,0,0,10\n").unwrap();
        assert_eq!(read_sites(&bad).unwrap_err().to_string(), "s.csv:2: column 'lat': 91 is outside [-90, 90]");
        let bad = Table::parse("s.csv", b"site,lat,lon,dec,inc,n\nA,10,0,0,10,2.5\n").unwrap();
        assert!(read_sites(&bad).unwrap_err().to_string().starts_with("s.csv:2: column 'n':"));
        let bad = Table::parse("s.csv", b"site,lat,lon,dec\nA,10,0,0\n").unwrap();
        assert!(read_sites(&bad).unwrap_err().to_string().contains("inc"));
    }
}
