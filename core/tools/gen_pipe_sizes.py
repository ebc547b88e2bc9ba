"""Writes core/src/pipe_sizes.rs: nominal pipe sizes with outside and inside diameters.

Run offline once (the Rust code never calls Python):
    python3 core/tools/gen_pipe_sizes.py > core/src/pipe_sizes.rs
Needs fluids==1.0.26 (PyPI). Steel and PVC values are fluids.piping.nearest_pipe(NPS=n,
schedule=s) -> (NPS, Di, Do, t) in metres; ductile iron is typed from the AWWA
C150/C151 special thickness class table (see DUCTILE_IRON below).
"""
import fluids
from fluids.piping import nearest_pipe

assert fluids.__version__ == "1.0.26", fluids.__version__

INCH = 0.0254
STEEL_NPS = [2, 2.5, 3, 4, 6, 8, 10, 12, 14, 16, 18, 20, 24]
C900_NPS = [4, 6, 8, 10, 12]
# AWWA C150/A21.50 and C151/A21.51, special thickness classes table: outside
# diameter and the class 52 nominal wall, inches (from memory, checked against a
# pipe maker's reproduction of the table; no reference library carries it).
DUCTILE_IRON = [
    (4, 4.80, 0.29), (6, 6.90, 0.31), (8, 9.05, 0.33), (10, 11.10, 0.35),
    (12, 13.20, 0.37), (14, 15.30, 0.39), (16, 17.40, 0.40), (18, 19.50, 0.41),
    (20, 21.60, 0.42), (24, 25.80, 0.44),
]


def nps_text(n):
    return {2.5: "2-1/2"}.get(n, str(int(n)))


def key_text(n):
    return {2.5: "2.5"}.get(n, str(int(n)))


rows = []
for sched, family in (("40", "SteelSch40"), ("80", "SteelSch80")):
    for n in STEEL_NPS:
        nps, di, do, t = nearest_pipe(NPS=n, schedule=sched)
        assert nps == n
        rows.append((f"sch{sched}_{key_text(n)}", family, f"NPS {nps_text(n)}", do, di,
                     f"Steel Sch {sched}, NPS {nps_text(n)}",
                     f"nearest_pipe(NPS={n}, schedule='{sched}')"))
for n, od_in, t_in in DUCTILE_IRON:
    do, di = od_in * INCH, (od_in - 2 * t_in) * INCH
    rows.append((f"di52_{n}", "DuctileIronClass52", f"{n} in", do, di,
                 f"Ductile iron class 52, {n} in", f"AWWA C150/C151 table: OD {od_in} in, wall {t_in} in"))
for n in C900_NPS:
    nps, di, do, t = nearest_pipe(NPS=n, schedule="DR18C900")
    assert nps == n
    rows.append((f"c900dr18_{n}", "PvcC900Dr18", f"{n} in", do, di,
                 f"PVC AWWA C900 DR18, {n} in", f"nearest_pipe(NPS={n}, schedule='DR18C900')"))

MM = 0.001
# EN 545 (ductile-iron pipes for water), socket-and-spigot pipe: outside diameter DE
# by DN (from memory; the same DE series as ISO 2531) and the class K9 nominal wall
# e = K (0.5 + 0.001 DN) with K = 9 and at least 6 mm (EN 545:2006, from memory).
EN545_DE = [
    (80, 98), (100, 118), (125, 144), (150, 170), (200, 222), (250, 274), (300, 326),
    (350, 378), (400, 429), (450, 480), (500, 532), (600, 635), (700, 738), (800, 842),
    (900, 945), (1000, 1048), (1100, 1152), (1200, 1255),
]
for dn, de in EN545_DE:
    e = max(6.0, round(9 * (0.5 + 0.001 * dn), 2))
    rows.append((f"en545k9_{dn}", "DuctileIronEn545K9", f"DN {dn}", de * MM, (de - 2 * e) * MM,
                 f"Ductile iron EN 545 K9, DN {dn}", f"EN 545: DE {de} mm, K9 wall 9 x (0.5 + 0.001 x {dn}) = {e} mm"))

# ISO 4065 wall thicknesses e_min (mm) by outside diameter, as tabulated in ISO 4427-2
# (PE) and ISO 1452-2 (PVC-U) for the same SDR (from memory, checked against pipe
# makers' reproductions of the ISO 4427-2 table). ID = OD - 2 e_min.
WALLS = {
    11: {63: 5.8, 75: 6.8, 90: 8.2, 110: 10.0, 125: 11.4, 140: 12.7, 160: 14.6, 180: 16.4, 200: 18.2,
         225: 20.5, 250: 22.7, 280: 25.4, 315: 28.6, 355: 32.2, 400: 36.3, 450: 40.9, 500: 45.4,
         560: 50.8, 630: 57.2, 710: 64.5, 800: 72.6, 900: 81.7, 1000: 90.2},
    17: {63: 3.8, 75: 4.5, 90: 5.4, 110: 6.6, 125: 7.4, 140: 8.3, 160: 9.5, 180: 10.7, 200: 11.9,
         225: 13.4, 250: 14.8, 280: 16.6, 315: 18.7, 355: 21.1, 400: 23.7, 450: 26.7, 500: 29.7,
         560: 33.2, 630: 37.4, 710: 42.1, 800: 47.4, 900: 53.3, 1000: 59.3},
    21: {90: 4.3, 110: 5.3, 125: 6.0, 140: 6.7, 160: 7.7, 180: 8.6, 200: 9.6, 225: 10.8, 250: 11.9,
         280: 13.4, 315: 15.0, 355: 16.9, 400: 19.1, 450: 21.5, 500: 23.9, 560: 26.7, 630: 30.0},
}
for sdr, family in ((11, "PeIso4427Sdr11"), (17, "PeIso4427Sdr17")):
    for od, e in WALLS[sdr].items():
        rows.append((f"iso4427sdr{sdr}_{od}", family, f"{od} mm", od * MM, (od - 2 * e) * MM,
                     f"PE ISO 4427 SDR {sdr}, {od} mm", f"ISO 4427-2: {od} x {e} mm (e_min)"))
for sdr, family in ((21, "PvcIso1452Sdr21"), (17, "PvcIso1452Sdr17")):
    for od, e in WALLS[sdr].items():
        if od < 90 or od > 630:
            continue
        rows.append((f"iso1452sdr{sdr}_{od}", family, f"{od} mm", od * MM, (od - 2 * e) * MM,
                     f"PVC-U ISO 1452 SDR {sdr}, {od} mm", f"ISO 1452-2: {od} x {e} mm (e_min)"))

# EN 10220 (seamless and welded steel tubes: dimensions), series 1 outside diameters
# with one common wall of the standard's wall series per size (the pairing is common
# practice for water and process lines, no source; the OD and wall values are the
# standard's, from memory).
EN10220 = [
    (60.3, 2.9), (76.1, 2.9), (88.9, 3.2), (114.3, 3.6), (139.7, 4.0), (168.3, 4.5), (219.1, 6.3),
    (273.0, 6.3), (323.9, 7.1), (355.6, 8.0), (406.4, 8.8), (457.0, 10.0), (508.0, 11.0), (610.0, 12.5),
]
for od, e in EN10220:
    key_od = f"{od:g}"
    rows.append((f"en10220_{key_od}", "SteelEn10220", f"{key_od} mm", od * MM, (od - 2 * e) * MM,
                 f"Steel EN 10220, {key_od} x {e:g} mm", f"EN 10220: OD {od} mm, wall {e} mm"))

print('''//! Pipe size presets: nominal sizes with outside and inside diameters for common
//! pressure-pipe families, so a page can offer "12 in ductile iron" instead of two
//! typed diameters. Typed diameters always override a preset.
//!
//! GENERATED by `core/tools/gen_pipe_sizes.py` (do not edit by hand); values in metres.
//!
//! # Sources
//! - Steel, schedules 40 and 80, NPS 2 to 24: ASME B36.10M (welded and seamless
//!   wrought steel pipe), as tabulated in the Python package `fluids==1.0.26`:
//!   `fluids.piping.nearest_pipe(NPS=n, schedule='40')` (and `'80'`) → (NPS, Di, Do, t).
//!   fluids notes that its metric table and the inch table differ below 0.1 mm.
//! - Ductile iron, special thickness class 52, 4 to 24 in: ANSI/AWWA C150/A21.50 and
//!   C151/A21.51, table of special thickness classes (outside diameter and nominal
//!   wall). Typed from memory and checked against a pipe maker's reproduction of
//!   that table. ID = OD − 2 × nominal wall, before any cement-mortar lining (the
//!   lining narrows the bore by a few millimetres; it does not change the OD).
//! - PVC pressure pipe, AWWA C900 DR18 (cast-iron outside diameters), 4 to 12 in:
//!   `fluids==1.0.26`, `fluids.piping.nearest_pipe(NPS=n, schedule='DR18C900')`.
//!
//! - Ductile iron to EN 545 (DN 80 to DN 1200): the socket-and-spigot pipe's outside
//!   diameter DE and the class K9 nominal wall e = 9 × (0.5 + 0.001·DN) mm, at least
//!   6 mm (EN 545:2006; from memory). Later editions (EN 545:2010) grade pipe by
//!   pressure class (C25, C30, C40, …) with other walls: type the wall or the bore
//!   for those. ID = DE − 2e, before the cement-mortar lining.
//! - PE to ISO 4427-2 (SDR 11 and SDR 17, 63 to 1000 mm) and PVC-U to ISO 1452-2
//!   (SDR 21 and SDR 17, 90 to 630 mm): the nominal outside diameter and the minimum
//!   wall e_min of the ISO 4065 series, typed from memory of the ISO 4427-2 table and
//!   checked against pipe makers' reproductions of it; ID = OD − 2·e_min (the mean
//!   wall is a little thicker, so the bore is a little smaller).
//! - Steel to EN 10220 (series 1 outside diameters, 60.3 to 610 mm) with one common
//!   wall of the standard's wall series per size (from memory; the pairing of wall
//!   and size is common practice, no source): type the wall or bore for another.

use crate::catalog::ChoiceOption;

/// A family of pipe whose sizes are tabulated here.
#[derive(Clone, Copy, Debug, PartialEq, Eq)]
pub enum Family {
    SteelSch40,
    SteelSch80,
    DuctileIronClass52,
    PvcC900Dr18,
    DuctileIronEn545K9,
    PeIso4427Sdr11,
    PeIso4427Sdr17,
    PvcIso1452Sdr21,
    PvcIso1452Sdr17,
    SteelEn10220,
}

impl Family {
    /// The published dimension standard the family's values come from, as users
    /// read it. (How the values were obtained is in the module doc: the steel and
    /// PVC tables through `fluids==1.0.26`, the ductile-iron table typed from memory
    /// and checked against a pipe maker's reproduction.)
    pub fn source(self) -> &'static str {
        match self {
            Family::SteelSch40 | Family::SteelSch80 => {
                "ASME B36.10M, welded and seamless wrought steel pipe (checked against an independent library)"
            }
            Family::DuctileIronClass52 => "ANSI/AWWA C150/A21.50 and C151/A21.51, special thickness class 52",
            Family::PvcC900Dr18 => "ANSI/AWWA C900, DR18 (checked against an independent library)",
            Family::DuctileIronEn545K9 => "EN 545, ductile iron pipe, class K9 (outside diameters and wall formula)",
            Family::PeIso4427Sdr11 | Family::PeIso4427Sdr17 => "ISO 4427-2, polyethylene pipe, SDR series",
            Family::PvcIso1452Sdr21 | Family::PvcIso1452Sdr17 => "ISO 1452-2, PVC-U pipe, SDR series",
            Family::SteelEn10220 => "EN 10220, steel tubes (outside diameters; one common wall per size)",
        }
    }
}

/// One preset size.
#[derive(Clone, Copy, Debug, PartialEq)]
pub struct PipeSize {
    /// Choice key used in URLs (`di52_12`).
    pub key: &'static str,
    pub family: Family,
    /// Nominal size as people say it (`NPS 12`, `12 in`).
    pub nominal: &'static str,
    /// Outside diameter, m.
    pub od: f64,
    /// Inside diameter, m.
    pub id: f64,
}

/// Every preset, in selector order.
pub const SIZES: &[PipeSize] = &[''')
for key, fam, nominal, do, di, label, call in rows:
    print(f'    // {call}')
    print(f'    PipeSize {{ key: "{key}", family: Family::{fam}, nominal: "{nominal}", od: {do!r}, id: {di!r} }},')
print('];')
print('''
/// Key of the option that means "use the typed diameters".
pub const CUSTOM: &str = "custom";

/// The options of a size choice field: typed diameters first, then every preset.
pub const SIZE_OPTIONS: &[ChoiceOption] = &[
    ChoiceOption { key: CUSTOM, label: "Typed diameters (no preset)" },''')
for key, fam, nominal, do, di, label, call in rows:
    text = f"{label}: OD {do*1000:.1f} mm ({do/INCH:.3f} in), ID {di*1000:.1f} mm ({di/INCH:.3f} in)"
    print(f'    ChoiceOption {{ key: "{key}", label: "{text}" }},')
print('''];

/// The preset with this key, if any (`None` for [`CUSTOM`] and unknown keys).
pub fn find(key: &str) -> Option<&'static PipeSize> {
    SIZES.iter().find(|s| s.key == key)
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn every_preset_is_an_option_and_sane() {
        assert_eq!(SIZE_OPTIONS.len(), SIZES.len() + 1);
        for s in SIZES {
            assert!(SIZE_OPTIONS.iter().any(|o| o.key == s.key), "{}", s.key);
            assert!(s.id > 0.0 && s.id < s.od && s.od < 1.3, "{}", s.key);
        }
    }

    #[test]
    fn ductile_iron_12_in_matches_the_table() {
        // AWWA C150/C151 special thickness class table: 12 in, OD 13.20 in, class 52 wall 0.37 in.
        let s = find("di52_12").map(|s| (s.od, s.id));
        assert_eq!(s, Some((13.20 * 0.0254, (13.20 - 0.74) * 0.0254)));
        assert!(find(CUSTOM).is_none());
    }

    #[test]
    fn metric_presets_match_their_tables() {
        // EN 545 DN 300: DE 326 mm, K9 wall 9 × (0.5 + 0.3) = 7.2 mm (from memory).
        let s = find("en545k9_300").map(|s| (s.od, s.id));
        assert_eq!(s, Some((0.326, (326.0 - 14.4) * 0.001)));
        // ISO 4427-2, 110 mm SDR 11: e_min 10.0 mm (from memory, checked).
        let s = find("iso4427sdr11_110").map(|s| (s.od, s.id));
        assert_eq!(s, Some((0.11, 0.09)));
    }
}''')
