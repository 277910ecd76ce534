//! Console summary: lines, worst fittings, findings by severity.

use comfy_table::{Table, presets::UTF8_FULL_CONDENSED};

use crate::audit::Audit;
use crate::error::Severity;

/// Render the summary as text.
pub fn summary(audit: &Audit) -> String {
    let mut out = String::new();
    let mut t = Table::new();
    t.load_style(UTF8_FULL_CONDENSED);
    t.set_header(["Line", "Service", "Flow m³/h", "Length m", "Friction m", "Fittings m", "Total m (range)", "Max v m/s"]);
    for l in &audit.lines {
        t.add_row([
            l.line.clone(),
            l.service.id().to_string(),
            format!("{:.1}", l.flow_m3_s * 3600.0),
            format!("{:.1}", l.length_m),
            format!("{:.3}", l.friction_head_m),
            format!("{:.3}", l.fittings_head_m),
            format!("{:.3} ({:.3}–{:.3})", l.total_head_m, l.total_head_low_m, l.total_head_high_m),
            format!("{:.2}", l.max_velocity_m_s),
        ]);
    }
    out.push_str(&t.to_string());
    out.push('\n');
    let mut worst: Vec<_> = audit.fittings.iter().collect();
    worst.sort_by(|a, b| b.head_m.total_cmp(&a.head_m));
    if !worst.is_empty() {
        let mut t = Table::new();
        t.load_style(UTF8_FULL_CONDENSED);
        t.set_header(["Worst fittings", "Line", "Kind", "Qty", "K", "Head m", "Cell"]);
        for f in worst.iter().take(5) {
            t.add_row([
                if f.tag.is_empty() { f.item.clone() } else { f.tag.clone() },
                f.line.clone(),
                f.kind.to_string(),
                format!("{}", f.qty),
                format!("{:.2}", f.k),
                format!("{:.3}", f.head_m),
                f.cell.to_string(),
            ]);
        }
        out.push_str(&t.to_string());
        out.push('\n');
    }
    out.push_str(&format!(
        "Findings: {} error, {} warning, {} info\n",
        audit.count(Severity::Error),
        audit.count(Severity::Warning),
        audit.count(Severity::Info)
    ));
    out
}
