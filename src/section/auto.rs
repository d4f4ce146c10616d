//! The automatic fit of a specimen without a pick, by the rule the settings name (shared by
//! `section` and the review page, so both show the same fits).

use super::settings::SectionSettings;
use crate::demag::{
    auto_line, last_component, AutoChoice, AutoOutcome, AutoRule, Grade, LastComponentRule, LastOutcome,
};
use crate::model::Anchor;
use crate::model::SpecimenSteps;

/// The last-component rule with the settings' limits.
pub fn last_rule(s: &SectionSettings) -> LastComponentRule {
    LastComponentRule {
        min_steps: s.min_steps.max(3),
        alpha: s.alpha,
        max_mad: s.max_mad,
        max_dang: s.max_dang,
        anchor: Anchor::Free,
        planes: true,
    }
}

/// The automatic fit of one specimen by the rule in `s.auto_rule`.
///
/// The earlier `longest` rule has no grades of its own: its lines are graded like the
/// last-component rule's (A for five or more steps with MAD and DANG ≤ 5°, otherwise B).
pub fn automatic_fit(sp: &SpecimenSteps, s: &SectionSettings) -> LastOutcome {
    if s.auto_rule == "longest" {
        let rule = AutoRule { min_steps: s.min_steps, max_mad: s.max_mad, max_dang: s.max_dang, anchor: Anchor::Free };
        return match auto_line(sp, &rule) {
            AutoOutcome::Fitted(f) => {
                let reason = format!("longest straight run heading for the origin: steps {}–{}", f.from, f.to);
                Ok(AutoChoice { grade: Grade::of_line(&f), fit: f, reason })
            }
            AutoOutcome::Unfitted(why) => Err(why),
        };
    }
    last_component(sp, &last_rule(s))
}

/// The rule in words, with its parameters, for reports.
pub fn rule_text(s: &SectionSettings) -> String {
    if s.auto_rule == "longest" {
        return format!(
            "the longest run of at least {} consecutive steps whose free principal-component line (Kirschvink 1980) has MAD ≤ {}° and DANG ≤ {}° (ties: smaller MAD, then the earlier run)",
            s.min_steps, s.max_mad, s.max_dang
        );
    }
    let r = last_rule(s);
    format!(
        "the last component: a free principal-component line (Kirschvink 1980) grown down from the last {} steps while each lower step lies on it within the noise (F-test at α = {}), accepted when it heads for the origin (DANG ≤ {}°, MAD ≤ {}°); otherwise a great circle through the origin grown the same way (grade C). Grades: A = line of 5+ steps with MAD and DANG ≤ 5°, B = other lines",
        r.min_steps, r.alpha, r.max_dang, r.max_mad
    )
}
