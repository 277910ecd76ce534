//! Fitting (minor) losses: the catalogue of fitting kinds, their loss models and the
//! free-text matcher for schedule `Item` cells.
//!
//! Every K returned here multiplies the velocity head `ρv²/2` of one stated bore
//! ([`FittingK::reference_diameter_m`]); for area changes that is always the smaller bore.
//! The catalogue itself is data ([`catalogue()`]); the models are pure `f64` functions in
//! [`models`] and [`opening`]. See `docs/fittings.md` for formulas, sources and validity.

mod catalogue;
mod matching;
pub mod models;
pub mod opening;
mod replacements;

pub use catalogue::{catalogue, find_kind};
pub use matching::{match_item, normalise_item};
pub use opening::{Characteristic, OpeningCurve, OpeningVariable};
pub use replacements::Replacement;

use crate::physics::friction::fully_turbulent;

/// Metres per inch (exact, NIST SP 811).
const IN_M: f64 = 0.0254;

/// Which bore's velocity a K refers to.
#[derive(Clone, Copy, Debug, PartialEq, Eq, serde::Serialize)]
#[serde(rename_all = "kebab-case")]
pub enum VelocityRef {
    /// The bore the fitting sits on (`d_in_m`).
    OwnBore,
    /// The smaller of inlet and outlet bores (area changes): the faster flow.
    SmallerBore,
}

/// Broad family of a fitting kind (for reports and grouping).
#[derive(Clone, Copy, Debug, PartialEq, Eq, Hash, serde::Serialize)]
#[serde(rename_all = "kebab-case")]
pub enum Group {
    /// Standard fittings: elbows and returns.
    Elbow,
    /// Pipe bends of any radius and mitre bends.
    Bend,
    /// Tees (run or branch).
    Tee,
    /// Isolating and regulating valves.
    Valve,
    /// Non-return valves.
    CheckValve,
    /// Strainers and foot valves with strainer.
    Strainer,
    /// Pipe entrances from a vessel or reservoir.
    Entrance,
    /// Pipe exit into a vessel or reservoir.
    Exit,
    /// Expansions, contractions, reducers, diffusers.
    AreaChange,
    /// Flow meters and orifice plates.
    Meter,
    /// Anything else (given values, equivalent length).
    Other,
}

/// Loss model of a kind, with its parameters (data, not code paths).
#[derive(Clone, Copy, Debug, PartialEq)]
pub enum Model {
    /// Darby 3-K: `K = K1/Re + Ki (1 + Kd / Dn^0.3)`, Dn nominal size in inches.
    Darby3K {
        /// Laminar constant K1.
        k1: f64,
        /// Turbulent constant Ki.
        ki: f64,
        /// Size constant Kd, inch^0.3.
        kd: f64,
    },
    /// Hooper 2-K: `K = K1/Re + K∞ (1 + 1/D)`, D inside diameter in inches.
    Hooper2K {
        /// Laminar constant K1.
        k1: f64,
        /// Turbulent constant K∞.
        kinf: f64,
    },
    /// A fixed K, independent of Re and size.
    Fixed {
        /// The loss coefficient.
        k: f64,
    },
    /// Smooth bend of any r/D and angle (Rennels & Hudson 2012, with the line's Colebrook f).
    Bend {
        /// r/D used when the row gives none.
        default_r_d: f64,
        /// Bend angle used when the row gives none, degrees.
        default_angle_deg: f64,
    },
    /// Single-joint mitre bend by angle (Rennels & Hudson 2012).
    Mitre {
        /// Mitre angle used when the row gives none, degrees.
        default_angle_deg: f64,
    },
    /// Sudden expansion, Borda-Carnot `(1-β²)²` on the smaller (inlet) bore.
    SuddenExpansion,
    /// Sudden (sharp-edged) contraction (Rennels & Hudson 2012), on the smaller (outlet) bore.
    SuddenContraction,
    /// Rounded contraction by r/d₂ (Rennels & Hudson 2012), on the smaller bore.
    RoundedContraction {
        /// r/d₂ used when the row gives none.
        default_r_d: f64,
    },
    /// Conical diffuser by included cone angle (Rennels & Hudson 2012), on the smaller bore.
    ConicalDiffuser {
        /// Included cone angle used when the row gives none, degrees.
        default_angle_deg: f64,
    },
    /// Conical contraction by included cone angle (Rennels & Hudson 2012), on the smaller bore.
    ConicalContraction {
        /// Included cone angle used when the row gives none, degrees.
        default_angle_deg: f64,
    },
    /// Concentric reducer: conical contraction or diffuser chosen from d_in/d_out.
    Reducer {
        /// Included cone angle used when the row gives none, degrees.
        default_angle_deg: f64,
    },
    /// Sharp-edged flush entrance (Rennels & Hudson 2012: K = 0.57).
    EntranceSharp,
    /// Rounded flush entrance by r/d (Rennels & Hudson 2012).
    EntranceRounded {
        /// r/d used when the row gives none.
        default_r_d: f64,
    },
    /// Inward-projecting (re-entrant) entrance by wall thickness t/d (Rennels & Hudson 2012).
    EntranceProjecting {
        /// t/d used when the row gives none.
        default_t_d: f64,
    },
    /// Chamfered (bevelled) flush entrance by bevel length l/d and angle (Rennels & Hudson 2012).
    EntranceBeveled {
        /// l/d used when the row gives none.
        default_l_d: f64,
        /// Bevel angle to the pipe axis used when the row gives none, degrees.
        default_angle_deg: f64,
    },
    /// Strainer: clean K times a fouling multiplier.
    Strainer {
        /// K of the clean strainer.
        k_clean: f64,
    },
    /// Foot valve with strainer: `K = n · f_T` (f_T of clean commercial steel at the bore)
    /// times a fouling multiplier.
    FootValve {
        /// Multiplier of f_T (420 poppet disc, 75 hinged disc).
        n: f64,
    },
    /// Square-edged orifice plate, permanent pressure loss per ISO 5167-1/-2 as K on the pipe bore.
    OrificePlate,
    /// Equivalent length: `K = f_T · Le/D`.
    EquivalentLength,
    /// No model: K, Kv, Cv or Le/D must be given in the schedule.
    Given,
}

/// One catalogue entry (data, not code paths): id, aliases, model + parameters, velocity
/// reference, source, band.
#[derive(Clone, Copy, Debug)]
pub struct Kind {
    /// Kebab-case id (trade words or our own), e.g. `elbow-90-long`.
    pub id: &'static str,
    /// One-line plain-English description.
    pub description: &'static str,
    /// Free-text spellings schedules use (matched after normalisation).
    pub aliases: &'static [&'static str],
    /// Loss model and its parameters.
    pub model: Model,
    /// Which bore's velocity the K refers to.
    pub reference: VelocityRef,
    /// Published source of the model constants (or "common practice (no source)").
    pub source: &'static str,
    /// Low multiplier of the uncertainty band (k_low = k · band_low).
    pub band_low: f64,
    /// High multiplier of the uncertainty band (k_high = k · band_high).
    pub band_high: f64,
    /// Broad family.
    pub group: Group,
    /// K-versus-opening data for partly open valves (None: opening not modelled).
    pub partial_opening: Option<&'static OpeningCurve>,
}

impl Kind {
    /// Short name of the kind's model, e.g. "Darby 3-K", "Hooper 2-K", "Borda-Carnot".
    pub fn model_name(&self) -> &'static str {
        match self.model {
            Model::Darby3K { .. } => "Darby 3-K",
            Model::Hooper2K { .. } => "Hooper 2-K",
            Model::Fixed { .. } => "fixed K",
            Model::Bend { .. } => "Rennels & Hudson bend",
            Model::Mitre { .. } => "Rennels & Hudson mitre",
            Model::SuddenExpansion => "Borda-Carnot",
            Model::SuddenContraction => "Rennels & Hudson sudden contraction",
            Model::RoundedContraction { .. } => "Rennels & Hudson rounded contraction",
            Model::ConicalDiffuser { .. } => "Rennels & Hudson conical diffuser",
            Model::ConicalContraction { .. } => "Rennels & Hudson conical contraction",
            Model::Reducer { .. } => "Rennels & Hudson reducer",
            Model::EntranceSharp => "Rennels & Hudson sharp entrance",
            Model::EntranceRounded { .. } => "Rennels & Hudson rounded entrance",
            Model::EntranceProjecting { .. } => "Rennels & Hudson projecting entrance",
            Model::EntranceBeveled { .. } => "Rennels & Hudson bevelled entrance",
            Model::Strainer { .. } => "strainer K x fouling",
            Model::FootValve { .. } => "foot valve n f_T x fouling",
            Model::OrificePlate => "ISO 5167 orifice permanent loss",
            Model::EquivalentLength => "Le/D x f_T",
            Model::Given => "given",
        }
    }

    /// True for isolating/regulating valves and check valves (and foot valves).
    pub fn is_valve(&self) -> bool {
        matches!(self.group, Group::Valve | Group::CheckValve)
            || matches!(self.model, Model::FootValve { .. })
    }
}

/// Everything a model may need for one fitting. The audit fills it from the fitting row and
/// its pipe run.
#[derive(Clone, Copy, Debug, Default)]
pub struct FittingInput {
    /// Nominal size of the fitting's (inlet) bore, inches (Darby Dn); None when unknown
    /// (then `d_in_m` in inches is used as an approximation).
    pub nps_in: Option<f64>,
    /// Inner diameter of the inlet bore (the run it sits on), m.
    pub d_in_m: f64,
    /// Outlet bore for area changes (Size out), m.
    pub d_out_m: Option<f64>,
    /// Reynolds number at `d_in_m`.
    pub re_in: f64,
    /// eps/D of the run (at `d_in_m`).
    pub relative_roughness: f64,
    /// Fraction open 0..=1; None = fully open.
    pub opening: Option<f64>,
    /// K given in the schedule (overrides the model).
    pub k_given: Option<f64>,
    /// Kv given (m³/h at 1 bar), converted on the reference bore.
    pub kv_given: Option<f64>,
    /// Cv given (US gpm at 1 psi), converted on the reference bore.
    pub cv_given: Option<f64>,
    /// Equivalent length in diameters, K = f_T · Le/D.
    pub le_d: Option<f64>,
    /// r/D of a bend, rounded entrance (r/d) or rounded contraction (r/d₂).
    pub bend_radius_d: Option<f64>,
    /// Bend or mitre angle; included cone angle of diffusers, contractions and reducers;
    /// bevel angle of a beveled entrance; degrees.
    pub angle_deg: Option<f64>,
    /// Fouling multiplier of a strainer (>= 1; None = clean).
    pub fouling: Option<f64>,
    /// Orifice-to-pipe diameter ratio d/D of an orifice plate.
    pub beta: Option<f64>,
    /// A second geometry ratio: bevel length l/d of a beveled entrance, or wall thickness t/d
    /// of a projecting entrance. None = the kind's default.
    pub length_ratio: Option<f64>,
    /// Inherent characteristic used to scale a given Kv/Cv with `opening`
    /// (None = equal percentage, rangeability 50).
    pub characteristic: Option<Characteristic>,
}

/// K of one fitting item, with its band and what it refers to.
#[derive(Clone, Copy, Debug, PartialEq, serde::Serialize)]
pub struct FittingK {
    /// Loss coefficient (per item).
    pub k: f64,
    /// Low end of the uncertainty band.
    pub k_low: f64,
    /// High end of the uncertainty band.
    pub k_high: f64,
    /// Bore whose velocity K refers to (smaller bore for area changes), m.
    pub reference_diameter_m: f64,
    /// Model name (or "given K", "given Kv", "given Cv", "Le/D x f_T").
    pub model: &'static str,
    /// Source of the constants (or "given in schedule").
    pub source: &'static str,
}

/// Why a K could not be evaluated.
#[derive(Clone, Debug, PartialEq, thiserror::Error)]
#[non_exhaustive]
pub enum FittingError {
    /// The valve is closed (opening 0): no flow through this line.
    #[error("{id} is closed (opening 0): no flow can pass")]
    Closed {
        /// Kind id.
        id: &'static str,
    },
    /// A value the model needs is missing.
    #[error("{id} needs {what}")]
    Missing {
        /// Kind id.
        id: &'static str,
        /// What is missing, in plain words.
        what: &'static str,
    },
    /// An input is outside the range the model accepts.
    #[error("{what} = {value} is outside the accepted range {range}")]
    OutOfRange {
        /// Which input.
        what: &'static str,
        /// The offending value.
        value: f64,
        /// The accepted range, in words.
        range: &'static str,
    },
    /// Bores contradict the kind (e.g. an "expansion" whose outlet is smaller).
    #[error("{id}: inlet {d_in_m} m to outlet {d_out_m} m contradicts the kind")]
    WrongDirection {
        /// Kind id.
        id: &'static str,
        /// Inlet bore, m.
        d_in_m: f64,
        /// Outlet bore, m.
        d_out_m: f64,
    },
    /// A partial opening was given for a kind without K-versus-opening data.
    #[error("{id} has no K-versus-opening data; give K, Kv or Cv for the partly open state")]
    OpeningNotModelled {
        /// Kind id.
        id: &'static str,
    },
}

/// Kv ↔ Cv ratio: Cv = 1.156 Kv (1 m³/h = 4.402868 US gpm; √(1 psi / 1 bar) = 0.262576;
/// IEC 60534-1 / ISA-75.01.01 definitions).
pub const CV_PER_KV: f64 = 1.156_099_228_353_656_6;

/// Kv (m³/h at 1 bar) → K on bore d.
///
/// # Formula
/// `K = 1.6e-3 · d_mm⁴ / Kv²` (= 1.6e9 d_m⁴/Kv²), from Δp = K ρv²/2 with Δp = 1 bar and
/// ρ ≈ 999.3 kg/m³ (water at 15.6 °C); ρ = 1000 exactly gives 1.5989e-3 (0.07 % lower).
/// # Source
/// IEC 60534-1 (definition of Kv); the 1.6e-3 constant as in ISA-75.01.01-2007 (60534-2-1 Mod).
/// # Validity
/// Kv > 0, d > 0; returns +inf for Kv = 0 and NaN for non-physical inputs (callers check).
pub fn kv_to_k(kv: f64, d_m: f64) -> f64 {
    let d2 = d_m * d_m;
    1.6e9 * d2 * d2 / (kv * kv)
}

/// Cv (US gpm at 1 psi) → K on bore d, via Kv = Cv / 1.156.
///
/// # Formula
/// `K = 1.6e-3 · d_mm⁴ / (Cv/1.156)²`.
/// # Source
/// IEC 60534-1 / ISA-75.01.01-2007 definitions of Kv and Cv.
/// # Validity
/// Cv > 0, d > 0.
pub fn cv_to_k(cv: f64, d_m: f64) -> f64 {
    kv_to_k(cv / CV_PER_KV, d_m)
}

/// Band used for a K given directly in the schedule: ±10 % (common practice, no source).
pub const GIVEN_K_BAND: (f64, f64) = (0.9, 1.1);
/// Band used for a given Kv/Cv: the Kv tolerance ±10 % (common practice for rated Kv, from
/// memory of IEC 60534-2-4) carried through K ∝ 1/Kv²: 1/1.1² .. 1/0.9².
pub const GIVEN_KV_BAND: (f64, f64) = (1.0 / (1.1 * 1.1), 1.0 / (0.9 * 0.9));
/// Band used for Le/D × f_T (common practice, no source): the method ignores Re and size.
pub const LE_D_BAND: (f64, f64) = (0.7, 1.5);
/// Minimum band for partly open valves (common practice, no source): opening data are coarse.
/// Each kind's curve widens it where the published tables disagree ([`OpeningCurve::band`]).
pub const PARTLY_OPEN_BAND: (f64, f64) = (0.6, 1.6);

fn check_finite_pos(what: &'static str, v: f64) -> Result<f64, FittingError> {
    if v.is_finite() && v > 0.0 {
        Ok(v)
    } else {
        Err(FittingError::OutOfRange {
            what,
            value: v,
            range: "finite and > 0",
        })
    }
}

fn check_opt_finite_nonneg(
    what: &'static str,
    v: Option<f64>,
) -> Result<Option<f64>, FittingError> {
    match v {
        Some(x) if !(x.is_finite() && x >= 0.0) => Err(FittingError::OutOfRange {
            what,
            value: x,
            range: "finite and >= 0",
        }),
        other => Ok(other),
    }
}

/// Bore whose velocity the kind's K refers to.
fn reference_diameter(kind: &Kind, input: &FittingInput) -> Result<f64, FittingError> {
    let d_in = check_finite_pos("inlet diameter d_in_m", input.d_in_m)?;
    match kind.reference {
        VelocityRef::OwnBore => Ok(d_in),
        VelocityRef::SmallerBore => match input.d_out_m {
            Some(d_out) => Ok(d_in.min(check_finite_pos("outlet diameter d_out_m", d_out)?)),
            None => Ok(d_in),
        },
    }
}

fn banded(k: f64, band: (f64, f64), d: f64, model: &'static str, source: &'static str) -> FittingK {
    FittingK {
        k,
        k_low: k * band.0,
        k_high: k * band.1,
        reference_diameter_m: d,
        model,
        source,
    }
}

/// K of one item (per item, not times quantity). Given K/Kv/Cv (then Le/D) override the
/// model (source "given in schedule"); Kv/Cv are converted on the reference bore and, when an
/// opening is given, scaled by the inherent characteristic (default equal percentage, R = 50).
/// A closed valve (opening 0) → `Err(FittingError::Closed)`.
pub fn evaluate(kind: &Kind, input: &FittingInput) -> Result<FittingK, FittingError> {
    let d_ref = reference_diameter(kind, input)?;
    if !input.re_in.is_finite() || input.re_in < 0.0 {
        return Err(FittingError::OutOfRange {
            what: "Reynolds number",
            value: input.re_in,
            range: "finite and >= 0",
        });
    }
    let rr = input.relative_roughness;
    if !(rr.is_finite() && rr >= 0.0) {
        return Err(FittingError::OutOfRange {
            what: "relative roughness",
            value: rr,
            range: "finite and >= 0",
        });
    }
    let opening = match input.opening {
        None => None,
        Some(o) if o.is_finite() && (0.0..=1.0).contains(&o) => Some(o),
        Some(o) => {
            return Err(FittingError::OutOfRange {
                what: "opening",
                value: o,
                range: "0..=1 (fraction open)",
            });
        }
    };
    let valve_like = kind.is_valve() || matches!(kind.model, Model::Given);
    if opening == Some(0.0) && valve_like {
        return Err(FittingError::Closed { id: kind.id });
    }

    // Given values override the model.
    if let Some(k) = check_opt_finite_nonneg("given K", input.k_given)? {
        return Ok(banded(
            k,
            GIVEN_K_BAND,
            d_ref,
            "given K",
            "given in schedule",
        ));
    }
    let kv_cv = match (input.kv_given, input.cv_given) {
        (Some(kv), _) => Some((check_finite_pos("given Kv", kv)?, "given Kv")),
        (None, Some(cv)) => Some((check_finite_pos("given Cv", cv)? / CV_PER_KV, "given Cv")),
        (None, None) => None,
    };
    if let Some((kvs, model)) = kv_cv {
        let kv = match opening {
            Some(h) if h < 1.0 => input.characteristic.unwrap_or_default().kv_at(kvs, h)?,
            _ => kvs,
        };
        let k = kv_to_k(kv, d_ref);
        return Ok(banded(k, GIVEN_KV_BAND, d_ref, model, "given in schedule"));
    }
    if let Some(le_d) = check_opt_finite_nonneg("Le/D", input.le_d)? {
        let k = fully_turbulent(rr) * le_d;
        return Ok(banded(
            k,
            LE_D_BAND,
            d_ref,
            "Le/D x f_T",
            "given Le/D; f_T fully turbulent Colebrook limit of the pipe's eps/D",
        ));
    }

    let k_open = models::model_k(kind, input)?;
    let band = (kind.band_low, kind.band_high);
    match opening {
        Some(h) if h < 1.0 => {
            let Some(curve) = kind.partial_opening else {
                return Err(FittingError::OpeningNotModelled { id: kind.id });
            };
            let k = curve
                .k_at(k_open, h)
                .ok_or(FittingError::Closed { id: kind.id })?;
            let band = (
                band.0.min(curve.band.0).min(PARTLY_OPEN_BAND.0),
                band.1.max(curve.band.1).max(PARTLY_OPEN_BAND.1),
            );
            Ok(banded(k, band, d_ref, curve.model, curve.source))
        }
        _ => Ok(banded(
            k_open,
            band,
            d_ref,
            model_label(kind, input),
            kind.source,
        )),
    }
}

/// Model name as reported, saying where a geometry default applied that the reader should see:
/// a projecting entrance with no wall thickness uses t/d 0 (the conservative K 1.12).
fn model_label(kind: &Kind, input: &FittingInput) -> &'static str {
    match (kind.model, input.length_ratio) {
        (Model::EntranceProjecting { .. }, None) => {
            "Rennels & Hudson projecting entrance, wall not known: t/d 0 assumed"
        }
        (Model::EntranceProjecting { .. }, Some(_)) => {
            "Rennels & Hudson projecting entrance, t/d from the pipe's wall"
        }
        _ => kind.model_name(),
    }
}

/// Darby nominal size Dn from the input: `nps_in`, else the inside diameter in inches.
fn nominal_inches(input: &FittingInput) -> f64 {
    match input.nps_in {
        Some(n) if n.is_finite() && n > 0.0 => n,
        _ => input.d_in_m / IN_M,
    }
}
