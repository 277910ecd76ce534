//! Partly open valves: K-versus-opening data and inherent flow characteristics.

use super::{FittingError, PARTLY_OPEN_BAND};

/// What the published opening variable of a data series is.
#[derive(Clone, Copy, Debug, PartialEq)]
pub enum OpeningVariable {
    /// Lift or gate position as a fraction of the bore (h/D) or of full lift; opening = value.
    LiftFraction,
    /// Rotation from the fully open position in degrees (butterfly disc, plug or ball);
    /// opening = 1 − θ/`closed_deg`.
    ClosingAngle {
        /// Rotation at which the valve is shut, degrees.
        closed_deg: f64,
    },
}

/// K-versus-opening data of one valve type (points in the published variable), with the band
/// that covers the spread between the published tables for that type.
#[derive(Clone, Copy, Debug, PartialEq)]
pub struct OpeningCurve {
    /// Short name of the series.
    pub name: &'static str,
    /// The published opening variable.
    pub variable: OpeningVariable,
    /// (variable, K) points as published, K on the pipe bore.
    pub points: &'static [(f64, f64)],
    /// Model name reported for a partly open valve.
    pub model: &'static str,
    /// Source of the points and of the band (tables named).
    pub source: &'static str,
    /// Band multipliers (low, high) of a partly open K: they cover every point of the other
    /// published tables for this valve type (see `docs/fittings.md`, checked in
    /// `tests/fittings.rs`), and are never narrower than [`super::PARTLY_OPEN_BAND`].
    pub band: (f64, f64),
}

impl OpeningCurve {
    /// Opening fraction (0 shut .. 1 open) of a published variable value.
    fn opening_of(&self, v: f64) -> f64 {
        match self.variable {
            OpeningVariable::LiftFraction => v,
            OpeningVariable::ClosingAngle { closed_deg } => 1.0 - v / closed_deg,
        }
    }

    /// K at an opening fraction `h` for a valve whose fully open K is `k_open`.
    ///
    /// # Formula
    /// The published points with K above `k_open`, plus (1, `k_open`), interpolated linearly
    /// in ln K against opening; below the most closed point, `K = K₀ (h₀/h)²` (loss ∝ 1/area²
    /// with area ∝ opening). Strictly rising as the valve closes.
    /// # Source
    /// Data: see [`OpeningCurve::source`]; the interpolation rule is our own (common practice).
    /// # Validity
    /// 0 < h ≤ 1; h ≤ 0 → None (closed).
    pub fn k_at(&self, k_open: f64, h: f64) -> Option<f64> {
        if !h.is_finite() || h <= 0.0 {
            return None;
        }
        let k_open = k_open.max(1e-9);
        if h >= 1.0 {
            return Some(k_open);
        }
        // (opening, K) ascending in opening.
        let mut pts: Vec<(f64, f64)> = self
            .points
            .iter()
            .map(|&(v, k)| (self.opening_of(v), k))
            .filter(|&(o, k)| k > k_open && o > 0.0 && o < 1.0)
            .collect();
        pts.sort_by(|a, b| a.0.total_cmp(&b.0));
        pts.push((1.0, k_open));
        let (o0, k0) = pts[0];
        if h <= o0 {
            return Some(k0 * (o0 / h) * (o0 / h));
        }
        for w in pts.windows(2) {
            let (oa, ka) = w[0];
            let (ob, kb) = w[1];
            if h <= ob {
                let t = (h - oa) / (ob - oa);
                return Some((ka.ln() + t * (kb.ln() - ka.ln())).exp());
            }
        }
        Some(k_open)
    }
}

/// Gate valve, K vs h/D: Weisbach's classical table for a gate in a circular pipe. The band
/// reaches 4.5× because the tables of commercial gate valves give two to four times the K at
/// half and three-quarters open.
pub static GATE: OpeningCurve = OpeningCurve {
    name: "gate valve vs h/D",
    variable: OpeningVariable::LiftFraction,
    points: &[
        (0.125, 97.8),
        (0.25, 17.0),
        (0.375, 5.52),
        (0.5, 2.06),
        (0.625, 0.81),
        (0.75, 0.26),
        (0.875, 0.07),
    ],
    model: "partly open gate (Weisbach table, ln K interpolation)",
    source: "Weisbach's table, gate in a circular pipe, K vs h/D (classical; reprinted in \
             engineering handbooks); band 0.6-4.5 covers the Hydraulic Institute table (Perry's \
             Chemical Engineers' Handbook, Table 6-4), Carvill, Mechanical Engineer's Data \
             Handbook, p. 151, and Idelchik, Flow Resistance (1989), diagrams 9-5 and 9-6",
    band: (0.6, 4.5),
};

/// Butterfly (throttle) disc in a circular pipe, K vs disc angle from open. The band reaches
/// down to 0.4× because a textbook table gives less than half of Weisbach's K at 70°.
pub static BUTTERFLY: OpeningCurve = OpeningCurve {
    name: "butterfly disc vs angle",
    variable: OpeningVariable::ClosingAngle { closed_deg: 90.0 },
    points: &[
        (5.0, 0.24),
        (10.0, 0.52),
        (20.0, 1.54),
        (30.0, 3.91),
        (40.0, 10.8),
        (50.0, 32.6),
        (60.0, 118.0),
        (70.0, 751.0),
    ],
    model: "partly open butterfly (Weisbach table, ln K interpolation)",
    source: "Weisbach's table, butterfly disc in a circular pipe, 10-70 deg; 5 deg from the \
             Hydraulic Institute table (Perry's Chemical Engineers' Handbook, Table 6-4), which \
             agrees with Weisbach at 10-60 deg; band 0.4-1.6 covers an environmental-engineering \
             textbook table (4th ed., Table 6-4: K about 10 at 40 deg, 320 at 70 deg)",
    band: (0.4, 1.6),
};

/// Plug cock (also used for ball valves), K vs rotation from open.
pub static PLUG_COCK: OpeningCurve = OpeningCurve {
    name: "plug cock vs angle",
    variable: OpeningVariable::ClosingAngle { closed_deg: 90.0 },
    points: &[
        (5.0, 0.05),
        (10.0, 0.29),
        (20.0, 1.56),
        (30.0, 5.47),
        (40.0, 17.3),
        (50.0, 52.6),
        (60.0, 206.0),
        (65.0, 486.0),
    ],
    model: "partly open plug/ball (Weisbach plug-cock table, ln K interpolation)",
    source: "Weisbach's table, plug cock in a circular pipe, 10-65 deg; 5 deg from the Hydraulic \
             Institute table (Perry's Chemical Engineers' Handbook, Table 6-4), which agrees with \
             Weisbach at 10-60 deg; ball valves borrow this curve; band 0.6-1.6 (common practice: \
             the two tables agree)",
    band: PARTLY_OPEN_BAND,
};

/// Globe valve with plug disc, K vs fraction of full lift.
pub static GLOBE: OpeningCurve = OpeningCurve {
    name: "globe valve (plug disc) vs lift",
    variable: OpeningVariable::LiftFraction,
    points: &[(0.25, 112.0), (0.5, 36.0), (0.75, 13.0)],
    model: "partly open globe, plug disc (Hydraulic Institute table, ln K interpolation)",
    source: HI_TABLE_GLOBE,
    band: PARTLY_OPEN_BAND,
};
const HI_TABLE_GLOBE: &str = "Hydraulic Institute table of partly open valves (Perry's Chemical \
                              Engineers' Handbook, Table 6-4), globe valve with plug disc at 1/4, \
                              1/2, 3/4 open; band 0.6-1.6 (common practice: one table)";

/// Globe valve with bevel seat, K vs fraction of full lift (much flatter than the plug disc).
pub static GLOBE_BEVEL_SEAT: OpeningCurve = OpeningCurve {
    name: "globe valve (bevel seat) vs lift",
    variable: OpeningVariable::LiftFraction,
    points: &[(0.5, 9.5)],
    model: "partly open globe, bevel seat (Hydraulic Institute table, ln K interpolation)",
    source: "Hydraulic Institute table of partly open valves (Perry's Chemical Engineers' \
             Handbook, Table 6-4), globe valve with bevel seat at 1/2 open; band 0.6-1.6 (common \
             practice: one point)",
    band: PARTLY_OPEN_BAND,
};

/// Globe valve with composition seat, K vs fraction of full lift (much flatter than the plug disc).
pub static GLOBE_COMPOSITION_SEAT: OpeningCurve = OpeningCurve {
    name: "globe valve (composition seat) vs lift",
    variable: OpeningVariable::LiftFraction,
    points: &[(0.5, 8.5)],
    model: "partly open globe, composition seat (Hydraulic Institute table, ln K interpolation)",
    source: "Hydraulic Institute table of partly open valves (Perry's Chemical Engineers' \
             Handbook, Table 6-4), globe valve with composition seat at 1/2 open; band 0.6-1.6 \
             (common practice: one point)",
    band: PARTLY_OPEN_BAND,
};

/// Diaphragm valve, K vs fraction of full lift.
pub static DIAPHRAGM: OpeningCurve = OpeningCurve {
    name: "diaphragm valve vs lift",
    variable: OpeningVariable::LiftFraction,
    points: &[(0.25, 21.0), (0.5, 4.3), (0.75, 2.6)],
    model: "partly open diaphragm (Hydraulic Institute table, ln K interpolation)",
    source: "Hydraulic Institute table of partly open valves (Perry's Chemical Engineers' \
             Handbook, Table 6-4), diaphragm valve at 1/4, 1/2, 3/4 open; band 0.6-1.6 (common \
             practice: one table)",
    band: PARTLY_OPEN_BAND,
};

/// Inherent flow characteristic of a control valve, used to scale a given Kv/Cv (taken as
/// the rated Kvs at full travel) to a partial opening.
#[derive(Clone, Copy, Debug, PartialEq, serde::Serialize)]
#[serde(rename_all = "kebab-case")]
pub enum Characteristic {
    /// `Kv = Kvs · h`.
    Linear,
    /// `Kv = Kvs · R^(h − 1)`, R the inherent rangeability.
    EqualPercentage {
        /// Inherent rangeability R (> 1); 50 by default.
        rangeability: f64,
    },
}

/// Rangeability used for equal-percentage trim when none is given (common practice).
pub const DEFAULT_RANGEABILITY: f64 = 50.0;

impl Default for Characteristic {
    fn default() -> Self {
        Characteristic::EqualPercentage {
            rangeability: DEFAULT_RANGEABILITY,
        }
    }
}

impl Characteristic {
    /// Kv at relative travel `h` of a valve rated `kvs` at full travel.
    ///
    /// # Formula
    /// Linear `Kv = Kvs h`; equal percentage `Kv = Kvs R^(h−1)`.
    /// # Source
    /// IEC 60534-2-4:2009 (inherent flow characteristics and rangeability), ideal curves.
    /// # Validity
    /// 0 < h ≤ 1, R > 1. (Real equal-percentage trim departs from the ideal curve near
    /// closure.)
    pub fn kv_at(&self, kvs: f64, h: f64) -> Result<f64, FittingError> {
        if !(h > 0.0 && h <= 1.0) {
            return Err(FittingError::OutOfRange {
                what: "opening",
                value: h,
                range: "0 < h <= 1",
            });
        }
        match *self {
            Characteristic::Linear => Ok(kvs * h),
            Characteristic::EqualPercentage { rangeability } => {
                if !(rangeability.is_finite() && rangeability > 1.0) {
                    return Err(FittingError::OutOfRange {
                        what: "rangeability",
                        value: rangeability,
                        range: "> 1",
                    });
                }
                Ok(kvs * rangeability.powf(h - 1.0))
            }
        }
    }
}
