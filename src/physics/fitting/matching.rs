//! Free-text `Item` → catalogue kind.

use super::{Kind, catalogue};

/// Map one raw token to its canonical form ("" drops it).
fn canonical(tok: &str) -> &str {
    match tok {
        "ell" | "ells" | "elb" | "elbw" | "elbows" | "elbo" | "el" => "elbow",
        "vlv" | "valv" | "valves" | "vv" | "v" | "vlve" => "valve",
        "lr" | "long" | "ls" | "sweep" => "long",
        "radius" | "rad" => "",
        "sr" | "short" | "std" | "standard" | "normal" | "regular" => "",
        "deg" | "degree" | "degrees" | "x" | "pipe" | "type" | "pattern" => "",
        "nrv" | "chk" | "ck" | "chek" | "nonreturn" => "check",
        "bfv" | "bfly" | "btfly" | "bf" => "butterfly",
        "fb" | "fp" => "",
        "rb" | "rp" => "reduced",
        "thd" | "thrd" | "thread" | "threaded" | "screwed" | "scrd" | "scr" | "npt" | "bsp"
        | "bspt" => "threaded",
        "flgd" | "flg" | "flanged" | "flange" | "flgs" | "welded" | "bw" | "butt" | "buttweld"
        | "sw" => "",
        "welds" => "weld",
        "miter" | "mitred" | "mitered" | "mitre" | "segmented" => "mitre",
        "tees" | "t" => "tee",
        "thru" | "through" | "straight" | "line" => "run",
        "side" | "bullhead" | "bull" => "branch",
        "str" | "strnr" | "strainr" | "strainers" => "strainer",
        "wye" | "ytype" => "y",
        "bskt" | "pot" | "bucket" => "basket",
        "gt" => "gate",
        "glb" => "globe",
        "cock" => "plug",
        "diaph" => "diaphragm",
        "entry" | "intake" => "entrance",
        "square" => "sharp",
        "edged" | "edge" | "flush" | "mouth" | "with" | "w" | "cw" | "and" | "the" | "a" | "an"
        | "of" => "",
        "radiused" | "bellmouth" | "bell" => "rounded",
        "reentrant" | "inward" | "protruding" | "borda" => "projecting",
        "beveled" | "chamfered" | "chamfer" | "bevel" => "bevelled",
        "enlargement" => "expansion",
        "expander" | "increaser" => "reducer",
        "sudden" | "abrupt" => "",
        "reducing" | "red" | "swage" | "concentric" | "conc" | "eccentric" | "ecc" => "reducer",
        "cone" | "tapered" | "taper" | "gradual" => "conical",
        "disk" => "disc",
        "piston" => "lift",
        "flap" => "swing",
        "magmeter" | "mag" | "magnetic" | "electromagnetic" | "ultrasonic" | "flowmeter"
        | "emf" => "meter",
        "orifices" => "orifice",
        "bends" => "bend",
        "valve" => "valve",
        _ => tok,
    }
}

/// Split text into lowercase tokens at non-alphanumerics and letter/digit boundaries
/// (a '.' inside a number is kept: "1.5").
fn raw_tokens(text: &str) -> Vec<String> {
    let lower = text.to_lowercase().replace(['°', 'º', '˚'], " deg ");
    let mut out = Vec::new();
    let mut cur = String::new();
    let mut cur_digit = false;
    let chars: Vec<char> = lower.chars().collect();
    for (i, &c) in chars.iter().enumerate() {
        let next_digit = chars.get(i + 1).is_some_and(|n| n.is_ascii_digit());
        let is_num_char = c.is_ascii_digit() || (c == '.' && cur_digit && next_digit);
        let is_alpha = c.is_alphanumeric() && !c.is_ascii_digit();
        if is_num_char || is_alpha {
            if !cur.is_empty() && cur_digit != is_num_char {
                out.push(std::mem::take(&mut cur));
            }
            cur_digit = is_num_char;
            cur.push(c);
        } else if !cur.is_empty() {
            out.push(std::mem::take(&mut cur));
        }
    }
    if !cur.is_empty() {
        out.push(cur);
    }
    out
}

fn is_number(t: &str) -> bool {
    t.parse::<f64>().is_ok()
}

/// Normalise an item text to canonical tokens (case, punctuation, °/deg, LR/SR, vlv, x90,
/// "1.5D" → long, "3D" → bend, "non return" → check, ...). Order kept, duplicates removed.
pub fn normalise_item(text: &str) -> Vec<String> {
    let raw = raw_tokens(text);
    let mut toks: Vec<String> = Vec::new();
    let mut i = 0;
    while i < raw.len() {
        let t = raw[i].as_str();
        let next = raw.get(i + 1).map(String::as_str);
        // "r/d 1.5" → the number that follows is a radius ratio.
        if t == "r" && next == Some("d") {
            if let Some(n) = raw.get(i + 2).filter(|n| is_number(n)) {
                toks.push(radius_token(n).to_string());
                i += 3;
                continue;
            }
            i += 2;
            continue;
        }
        // "1.5d", "3d" (split into number + "d").
        if is_number(t) && next == Some("d") {
            toks.push(radius_token(t).to_string());
            i += 2;
            continue;
        }
        // "L.R." / "S.R." after punctuation is split into single letters.
        if matches!(t, "l" | "s") && next == Some("r") {
            if t == "l" {
                toks.push("long".into());
            }
            i += 2;
            continue;
        }
        if t == "non" && next == Some("return") {
            toks.push("check".into());
            i += 2;
            continue;
        }
        if t == "re" && next == Some("entrant") {
            toks.push("projecting".into());
            i += 2;
            continue;
        }
        if t == "stub" || t == "set" {
            // "stub in", "set on": drop the particle that follows.
            toks.push("stub".into());
            if matches!(next, Some("in") | Some("on")) {
                i += 1;
            }
            i += 1;
            continue;
        }
        if (t == "full" || t == "reduced") && matches!(next, Some("bore") | Some("port")) {
            if t == "reduced" {
                toks.push("reduced".into());
            }
            i += 2;
            continue;
        }
        let c = canonical(t);
        if !c.is_empty() {
            toks.push(c.to_string());
        }
        i += 1;
    }
    let mut seen = Vec::new();
    toks.retain(|t| {
        if seen.contains(t) {
            false
        } else {
            seen.push(t.clone());
            true
        }
    });
    toks
}

fn radius_token(n: &str) -> &'static str {
    match n.parse::<f64>() {
        Ok(v) if (v - 1.5).abs() < 1e-9 => "long",
        Ok(v) if v <= 1.0 => "",
        Ok(v) if (v - 2.0).abs() < 1e-9 => "2d",
        Ok(v) if (v - 4.0).abs() < 1e-9 => "4d",
        Ok(v) if (v - 6.0).abs() < 1e-9 => "6d",
        _ => "bend",
    }
}

fn sorted(mut v: Vec<String>) -> Vec<String> {
    v.sort();
    v.retain(|t| !t.is_empty());
    v
}

/// Token sets of every alias (and the id itself) of every kind, built once.
fn alias_sets() -> &'static [(&'static Kind, Vec<String>, String)] {
    static SETS: std::sync::OnceLock<Vec<(&'static Kind, Vec<String>, String)>> =
        std::sync::OnceLock::new();
    SETS.get_or_init(build_alias_sets)
}

fn build_alias_sets() -> Vec<(&'static Kind, Vec<String>, String)> {
    let mut out = Vec::new();
    for k in catalogue() {
        let id_text = k.id.replace('-', " ");
        out.push((k, sorted(normalise_item(&id_text)), id_text));
        for a in k.aliases {
            out.push((k, sorted(normalise_item(a)), (*a).to_string()));
        }
    }
    out
}

/// Free-text Item → kind (normalise case, punctuation, °/deg, LR/SR, vlv ...; aliases).
/// An empty item is the `given` kind. Err: up to 3 nearest ids.
///
/// Order: exact id; equal token sets with an alias; the longest alias whose tokens are all in
/// the text (a tie between kinds is ambiguous → Err with those ids); else nearest ids by
/// normalised Levenshtein similarity (strsim).
pub fn match_item(text: &str) -> Result<&'static Kind, Vec<&'static str>> {
    let trimmed = text.trim();
    if let Some(k) = super::find_kind(&trimmed.to_lowercase()) {
        return Ok(k);
    }
    let toks = sorted(normalise_item(trimmed));
    let sets = alias_sets();
    if toks.is_empty() {
        return super::find_kind("given").ok_or_else(Vec::new);
    }
    if let Some((k, _, _)) = sets.iter().find(|(_, s, _)| *s == toks) {
        return Ok(k);
    }
    // Longest alias contained in the text.
    let mut best: Vec<&'static Kind> = Vec::new();
    let mut best_len = 0;
    for (k, s, _) in sets {
        if s.is_empty() || !s.iter().all(|t| toks.contains(t)) {
            continue;
        }
        if s.len() > best_len {
            best_len = s.len();
            best = vec![*k];
        } else if s.len() == best_len && !best.iter().any(|b| b.id == k.id) {
            best.push(*k);
        }
    }
    if best.len() == 1 {
        return Ok(best[0]);
    }
    if best.len() > 1 {
        return Err(best.iter().take(3).map(|k| k.id).collect());
    }
    Err(nearest(&toks, sets))
}

/// Up to 3 nearest ids: kinds with an alias containing every word of the text come first,
/// then by normalised Levenshtein similarity of the normalised text to aliases and ids.
fn nearest(toks: &[String], sets: &[(&'static Kind, Vec<String>, String)]) -> Vec<&'static str> {
    let text = toks.join(" ");
    let mut scored: Vec<(f64, &'static str)> = Vec::new();
    for (k, s, raw) in sets {
        let joined = s.join(" ");
        let a = strsim::normalized_levenshtein(&text, &joined);
        let b = strsim::normalized_levenshtein(&text, &raw.to_lowercase());
        let contains_all = toks.iter().all(|t| s.contains(t));
        let score = a.max(b) + if contains_all { 1.0 } else { 0.0 };
        match scored.iter_mut().find(|(_, id)| *id == k.id) {
            Some(e) => e.0 = e.0.max(score),
            None => scored.push((score, k.id)),
        }
    }
    scored.sort_by(|a, b| b.0.total_cmp(&a.0));
    scored.into_iter().take(3).map(|(_, id)| id).collect()
}
