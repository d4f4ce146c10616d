//! The steps table (stepwise demagnetization).

use super::directions::{read_bedding, strat_axis};
use super::reader::Table;
use crate::error::TableError;
use crate::model::{SpecimenSteps, StepRecord, StepSet, Treatment};
use crate::sphere::Direction;

/// Read a steps table.
///
/// Within a specimen, rows must come in strictly increasing `step` order (a repeated or
/// decreasing step is an error naming both lines); `moment` must be positive; `site`, position
/// and bedding, when given, must agree between the rows of a specimen.
pub fn read_steps(t: &Table) -> Result<StepSet, TableError> {
    t.require_rows()?;
    let spec_c = t.require("specimen")?;
    let step_c = t.require("step")?;
    let dec_c = t.require("dec")?;
    let inc_c = t.require("inc")?;
    let mom_c = t.require("moment")?;
    let (site_c, treat_c) = (t.col("site"), t.col("treatment"));
    let axis = strat_axis(t)?;
    let mut specimens: Vec<SpecimenSteps> = Vec::new();
    let mut has_bedding = false;
    for row in &t.rows {
        let name = t.text(row, spec_c).to_string();
        if name.is_empty() {
            return Err(t.error(row.line, Some("specimen"), "is empty; expected a specimen name"));
        }
        let step = t.number(row, step_c)?;
        if step < 0.0 {
            return Err(t.error(
                row.line,
                Some("step"),
                format!("{step} is negative; expected a field (mT) or temperature (°C) ≥ 0"),
            ));
        }
        let dec = t.number_in(row, dec_c, -360.0, 360.0)?;
        let inc = t.number_in(row, inc_c, -90.0, 90.0)?;
        let direction = Direction::new(dec, inc).map_err(|e| t.error(row.line, Some("dec"), e.to_string()))?;
        let moment = t.number(row, mom_c)?;
        if moment == 0.0 {
            return Err(t.error(
                row.line,
                Some("moment"),
                "is zero: a step without remanence has no direction; leave the row out",
            ));
        }
        if moment < 0.0 {
            return Err(t.error(
                row.line,
                Some("moment"),
                format!("{moment} is negative; expected the intensity in A·m² (> 0)"),
            ));
        }
        let treatment = match t.opt_text(row, treat_c).map(|s| s.to_lowercase()).as_deref() {
            None => None,
            Some("nrm") => Some(Treatment::Nrm),
            Some("af") => Some(Treatment::Af),
            Some("thermal") => Some(Treatment::Thermal),
            Some(o) => return Err(t.error(row.line, Some("treatment"), format!("'{o}' is not nrm, af or thermal"))),
        };
        let site = t.opt_text(row, site_c);
        let position = match axis {
            Some((_, i)) => t.opt_number(row, Some(i))?,
            None => None,
        };
        let bedding = read_bedding(t, row)?;
        has_bedding |= bedding.is_some();
        let rec = StepRecord { line: row.line, step, direction, moment, treatment };
        match specimens.iter_mut().find(|s| s.specimen == name) {
            None => specimens.push(SpecimenSteps { specimen: name, site, position, bedding, steps: vec![rec] }),
            Some(s) => {
                let prev = s.steps.last().expect("a specimen has a step");
                if step == prev.step {
                    return Err(t.error(
                        row.line,
                        Some("step"),
                        format!("step {step} of specimen {name} is repeated (also on line {})", prev.line),
                    ));
                }
                if step < prev.step {
                    return Err(t.error(row.line, Some("step"), format!(
                        "step {step} of specimen {name} comes after step {} (line {}); steps must increase within a specimen",
                        prev.step, prev.line)));
                }
                if site.is_some() && s.site.is_some() && site != s.site {
                    return Err(t.error(
                        row.line,
                        Some("site"),
                        format!(
                            "specimen {name} is given site '{}' here but '{}' on line {}",
                            site.unwrap_or_default(),
                            s.site.clone().unwrap_or_default(),
                            s.steps[0].line
                        ),
                    ));
                }
                if s.site.is_none() {
                    s.site = site;
                }
                if s.position.is_none() {
                    s.position = position;
                }
                if s.bedding.is_none() {
                    s.bedding = bedding;
                }
                s.steps.push(rec);
            }
        }
    }
    Ok(StepSet { source: t.name.clone(), axis: axis.map(|a| a.0), has_bedding, specimens })
}
