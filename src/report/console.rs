//! Console summary: lines, worst fittings, the energy review, systems, findings by severity,
//! laid out by [`super::text_table`] to the terminal's width.

use super::text_table::{Align, TextTable, console_width, wrap_hanging};
use crate::audit::Audit;
use crate::error::Severity;
use crate::units::{UnitSystem, header_in};

/// Render the summary as text (SI units), fitted to the console's width
/// ([`console_width`]).
pub fn summary(audit: &Audit) -> String {
    summary_in(audit, UnitSystem::Si)
}

/// Lines listed on the console at most (all of them up to this many, in input order).
pub const CONSOLE_LINES: usize = 25;

/// Render the summary as text in the given units, fitted to the console's width.
pub fn summary_in(audit: &Audit, units: UnitSystem) -> String {
    summary_fitted(audit, units, console_width())
}

/// Prose fitted to `width` (unchanged without one), continuation lines indented by two.
pub fn fitted_text(text: &str, width: Option<usize>) -> String {
    match width {
        Some(w) => wrap_hanging(text, w, 2),
        None => format!("{text}\n"),
    }
}

/// Render the summary as text in the given units with no line wider than `width` (`None`: no
/// limit, every table at its natural width).
pub fn summary_fitted(audit: &Audit, units: UnitSystem, width: Option<usize>) -> String {
    use Align::{Left, Right};
    let mut out = String::new();
    let (flow, fq) = header_in("[m3/h]", units);
    let (len, fl) = header_in("[m]", units);
    let (vel, fv) = header_in("[m/s]", units);
    let strip = |s: String| s.trim_matches(['[', ']']).to_string();
    let (flow, len, vel) = (strip(flow), strip(len), strip(vel));
    let h = |name: &str, unit: &str| format!("{name}\n{unit}");
    let mut t = TextTable::new(&[
        ("Line", Left),
        ("Service", Left),
        (&h("Flow", &flow), Right),
        (&h("Length", &len), Right),
        (&h("Friction", &len), Right),
        (&h("Fittings", &len), Right),
        (&h("Total", &len), Right),
        (&h("Band", &len), Right),
        (&h("Max v", &vel), Right),
    ]);
    // A huge register would scroll the terminal for minutes: list the lines with the highest
    // total head and say where the rest are.
    let mut shown: Vec<&crate::audit::LineResult> = audit.lines.iter().collect();
    if shown.len() > CONSOLE_LINES {
        shown.sort_by(|a, b| b.total_head_m.total_cmp(&a.total_head_m));
        shown.truncate(CONSOLE_LINES);
    }
    for l in &shown {
        t.row(vec![
            l.line.clone(),
            l.service.id().to_string(),
            format!("{:.1}", l.flow_m3_s * 3600.0 * fq),
            format!("{:.1}", l.length_m * fl),
            format!("{:.3}", l.friction_head_m * fl),
            format!("{:.3}", l.fittings_head_m * fl),
            format!("{:.3}", l.total_head_m * fl),
            format!(
                "{:.2}–{:.2}",
                l.total_head_low_m * fl,
                l.total_head_high_m * fl
            ),
            format!("{:.2}", l.max_velocity_m_s * fv),
        ]);
    }
    out.push_str(&t.render(width));
    out.push_str(&fitted_text(
        "Band: total head with every fitting at the low and the high end of its K band.",
        width,
    ));
    if audit.lines.len() > shown.len() {
        out.push_str(&fitted_text(
            &format!(
                "The {} lines of {} with the highest total head; every line is in the workbook's Summary and Lines sheets.",
                shown.len(),
                audit.lines.len()
            ),
            width,
        ));
    }
    out.push('\n');
    // The five with the highest head, ties in input order (only those five are sorted).
    let mut worst: Vec<(usize, &crate::audit::FittingResult)> =
        audit.fittings.iter().enumerate().collect();
    let by_head = |a: &(usize, &crate::audit::FittingResult),
                   b: &(usize, &crate::audit::FittingResult)| {
        b.1.head_m.total_cmp(&a.1.head_m).then(a.0.cmp(&b.0))
    };
    if worst.len() > 5 {
        worst.select_nth_unstable_by(4, by_head);
        worst.truncate(5);
    }
    worst.sort_by(by_head);
    if !worst.is_empty() {
        let mut t = TextTable::new(&[
            ("Worst fittings", Left),
            ("Line", Left),
            ("Kind", Left),
            ("Qty", Right),
            ("K", Right),
            (&h("Head", &len), Right),
            ("Cell", Left),
        ]);
        for (_, f) in &worst {
            t.row(vec![
                if f.tag.is_empty() {
                    f.item.to_string()
                } else {
                    f.tag.to_string()
                },
                f.line.to_string(),
                f.kind.to_string(),
                format!("{}", f.qty),
                format!("{:.2}", f.k),
                format!("{:.3}", f.head_m * fl),
                f.cell.to_string(),
            ]);
        }
        out.push_str(&t.render(width));
        out.push('\n');
    }
    out.push_str(&super::ranking::console_energy(audit, units, width));
    out.push_str(&format!(
        "Findings: {} error, {} warning, {} info\n",
        audit.count(Severity::Error),
        audit.count(Severity::Warning),
        audit.count(Severity::Info)
    ));
    out
}

/// Draw `bar` on stderr once the run has taken more than a second, and only when stderr is a
/// terminal (short runs and redirected output print nothing extra). The bar starts hidden.
pub(crate) fn show_after_a_second(bar: &indicatif::ProgressBar) {
    use std::io::IsTerminal;
    if std::io::stderr().is_terminal() {
        let shown = bar.clone();
        std::thread::spawn(move || {
            std::thread::sleep(std::time::Duration::from_secs(1));
            if !shown.is_finished() {
                shown.set_draw_target(indicatif::ProgressDrawTarget::stderr());
                shown.enable_steady_tick(std::time::Duration::from_millis(120));
            }
        });
    }
}
