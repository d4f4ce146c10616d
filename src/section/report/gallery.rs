//! Every specimen in small drawings (vector-endpoint, equal-area, moment decay, with the fitted
//! steps marked), grouped by site in the order of the steps table. A drawing opens large when
//! clicked (the card becomes the page's target and CSS enlarges it: no script needed); rejected
//! specimens carry the reason.

use super::html::{escape, slug};
use super::sketch::{specimen_svg, FIT, HORIZONTAL, VERTICAL};
use crate::section::{SectionRun, SpecimenRecord};
use std::fmt::Write as _;

/// The HTML id of a specimen's card.
fn card_id(i: usize, name: &str) -> String {
    format!("sp-{}-{}", i + 1, slug(name))
}

fn unit(sp: &SpecimenRecord) -> &'static str {
    sp.steps.steps.iter().find_map(|s| s.treatment).map_or("", |t| t.unit())
}

fn caption(sp: &SpecimenRecord, site_note: Option<&str>) -> String {
    let u = unit(sp);
    let mut c = format!("<b>{}</b>", escape(&sp.steps.specimen));
    for f in &sp.fits {
        let _ = write!(
            c,
            " · {} {}–{} {u} ({} steps): {}°/{:.1}°, MAD {:.1}°",
            f.kind.as_str(),
            f.from,
            f.to,
            f.n_steps,
            crate::numbers::azimuth(f.direction.dec, 1),
            f.direction.inc,
            f.mad
        );
    }
    for why in &sp.rejected {
        let _ = write!(c, "<br><span class=\"why\">rejected: {}</span>", escape(why));
    }
    if let Some(n) = site_note {
        let _ = write!(c, "<br><span class=\"why\">{}</span>", escape(n));
    }
    c
}

/// Write the gallery section.
pub fn write(h: &mut String, run: &SectionRun) {
    let _ = writeln!(
        h,
        "<section id=\"specimens\" class=\"part\"><h2>Every specimen</h2>\n<p>Each card shows, left to right: the vector-endpoint diagram (north to the right; <span style=\"color:{HORIZONTAL}\">●</span> horizontal projection, <span style=\"color:{VERTICAL}\">○</span> vertical projection), the step directions on an equal-area net (filled lower hemisphere, open upper; <span style=\"color:{FIT}\">◆</span> the fitted direction) and the moment against the step, normalised to its largest value. The steps of the accepted fit are drawn in <span style=\"color:{FIT}\">vermillion</span>. Click a card to enlarge it. {} of {} specimens were rejected (red cards).</p>",
        run.specimens.iter().filter(|s| s.fits.is_empty() || !s.rejected.is_empty()).count(),
        run.specimens.len()
    );
    let mut sites: Vec<&str> = Vec::new();
    for sp in &run.specimens {
        let s = sp.steps.site.as_deref().unwrap_or("");
        if !sites.contains(&s) {
            sites.push(s);
        }
    }
    let means = run.table("site-means");
    for site in sites {
        let row =
            means.and_then(|t| t.rows.iter().find(|r| t.cell(r, "site").as_deref() == Some(site)).map(|r| (t, r)));
        let position = row.and_then(|(t, r)| t.columns.get(1).and_then(|c| t.cell(r, c).map(|v| format!("{c} {v} m"))));
        let site_reason = run.rejected.iter().find(|r| r.what == "site" && r.name == site).map(|r| r.reason.clone());
        let used = if site_reason.is_some() { "site mean not used" } else { "site mean used" };
        let _ = writeln!(
            h,
            "<div class=\"site\" id=\"site-{}\"><h3>Site {}{} · {used}</h3>\n<div class=\"cards\">",
            slug(site),
            escape(site),
            position.map_or(String::new(), |p| format!(" · {}", escape(&p)))
        );
        let note = site_reason.map(|r| format!("site {site} not used: {r}"));
        for (i, sp) in run.specimens.iter().enumerate().filter(|(_, s)| s.steps.site.as_deref().unwrap_or("") == site) {
            let id = card_id(i, &sp.steps.specimen);
            let rejected = sp.fits.is_empty() || !sp.rejected.is_empty();
            let _ = writeln!(
                h,
                "<figure class=\"card{}\" id=\"{id}\" data-specimen=\"{}\"><a class=\"close\" href=\"#specimens\">close ✕</a><a class=\"open\" href=\"#{id}\">{}</a><figcaption>{}</figcaption></figure>",
                if rejected { " rejected" } else { "" },
                escape(&sp.steps.specimen),
                specimen_svg(&sp.steps, &sp.fits, &escape(&sp.steps.specimen)),
                caption(sp, note.as_deref())
            );
        }
        let _ = writeln!(h, "</div></div>");
    }
    let _ = writeln!(h, "</section>");
}
