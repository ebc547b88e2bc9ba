//! CSV text of a result table, safe to open in a spreadsheet.
//!
//! The page offers every table as a CSV file, and some cells repeat text the user
//! typed (a line-schedule row's `tag=`). A spreadsheet runs a cell as a formula when
//! it starts with `=`, `+`, `-` or `@` (or a tab or carriage return before one of
//! those), so `-1+cmd|'/C calc'!A0` typed as a label would run when the file is
//! opened. Which character separates fields depends on the reader's locale (`,` in
//! English, `;` in most of Europe, a tab when pasted), so a cell is also cut at
//! every `,`, `;`, tab and line break, and each piece is judged as a cell start.
//!
//! The rule, in one place ([`neutralise`]), as the OWASP "CSV Injection" guidance
//! puts it: a piece that starts with a formula character (ASCII or its full-width
//! form) gets a leading apostrophe, which every spreadsheet reads as "this is text".
//! A plain number (`-12.5`, `+3`, `1.2e-5`) is left alone: it stays a number. The
//! result is written as RFC 4180 CSV: fields with a quote, a separator or a line
//! break in double quotes, quotes inside doubled, CRLF line ends.
//!
//! This is formatting of the core's text, not physics: it lives in the adapter with
//! the other wire shapes, and is tested natively.

use std::borrow::Cow;

/// Characters that make a spreadsheet read a cell start as a formula: `=`, `+`, `-`,
/// `@`, their full-width forms (read as formulas by some East Asian locales), and
/// tab and carriage return (stripped by some readers before the formula character).
fn starts_formula(ch: char) -> bool {
    matches!(ch, '=' | '+' | '-' | '@' | '\t' | '\r' | '＝' | '＋' | '－' | '＠')
}

/// Characters at which some reader starts a new cell or a new row: the field
/// separators of every locale (`,` `;` tab) and line breaks.
fn splits_cells(ch: char) -> bool {
    matches!(ch, ',' | ';' | '\t' | '\r' | '\n')
}

/// Whether `text` is a plain decimal number: an optional sign, digits with at most
/// one decimal point, and an optional exponent (`-12.5`, `+3`, `.5`, `1.2e-5`).
pub fn is_plain_number(text: &str) -> bool {
    let bytes = text.as_bytes();
    let mut i = 0;
    if matches!(bytes.first(), Some(b'+' | b'-')) {
        i += 1;
    }
    let mut digits = 0;
    let mut point = false;
    while i < bytes.len() {
        match bytes[i] {
            b'0'..=b'9' => digits += 1,
            b'.' if !point => point = true,
            _ => break,
        }
        i += 1;
    }
    if digits == 0 {
        return false;
    }
    if i < bytes.len() && matches!(bytes[i], b'e' | b'E') {
        i += 1;
        if matches!(bytes.get(i), Some(b'+' | b'-')) {
            i += 1;
        }
        let start = i;
        while i < bytes.len() && bytes[i].is_ascii_digit() {
            i += 1;
        }
        if i == start {
            return false;
        }
    }
    i == bytes.len()
}

/// Whether a cell start (the text up to the next separator) would be run as a
/// formula: it starts with a formula character and is not a plain number.
fn runs_as_formula(piece: &str) -> bool {
    piece.chars().next().is_some_and(starts_formula) && !is_plain_number(piece)
}

/// The cell with an apostrophe before every piece a spreadsheet would run as a
/// formula: at the start, and after each separator or line break of any locale.
/// Cells with nothing to neutralise are returned unchanged (borrowed).
pub fn neutralise(cell: &str) -> Cow<'_, str> {
    let mut starts = vec![0];
    starts.extend(
        cell.char_indices()
            .filter(|(_, ch)| splits_cells(*ch))
            .map(|(i, ch)| i + ch.len_utf8()),
    );
    let risky: Vec<usize> = starts
        .into_iter()
        .filter(|&start| {
            let rest = &cell[start..];
            // A cell that starts with a tab or CR: some readers strip it and read
            // what follows as the cell start.
            if start == 0 && rest.starts_with(['\t', '\r']) {
                return true;
            }
            let end = rest.find(splits_cells).unwrap_or(rest.len());
            runs_as_formula(&rest[..end])
        })
        .collect();
    if risky.is_empty() {
        return Cow::Borrowed(cell);
    }
    let mut out = String::with_capacity(cell.len() + risky.len());
    let mut last = 0;
    for start in risky {
        out.push_str(&cell[last..start]);
        out.push('\'');
        last = start;
    }
    out.push_str(&cell[last..]);
    Cow::Owned(out)
}

/// One CSV field: neutralised, then quoted (RFC 4180) when it holds a quote, a
/// separator of any locale or a line break.
pub fn field(cell: &str) -> String {
    let text = neutralise(cell);
    if text.contains(['"', ',', ';', '\t', '\r', '\n']) {
        format!("\"{}\"", text.replace('"', "\"\""))
    } else {
        text.into_owned()
    }
}

/// The CSV text of a table: the header row, then every row, each line ended by CRLF.
pub fn table(columns: &[String], rows: &[Vec<String>]) -> String {
    let mut out = String::new();
    for row in std::iter::once(columns).chain(rows.iter().map(Vec::as_slice)) {
        let fields: Vec<String> = row.iter().map(|cell| field(cell)).collect();
        out.push_str(&fields.join(","));
        out.push_str("\r\n");
    }
    out
}

/// The CSV text of a table read alone: a header block first (one `[label, value…]`
/// row per line: handbook version, page, link, each input with its unit, the sheet
/// fields), a blank line, then the table as [`table`] writes it. Every header cell
/// goes through the same [`field`] rule as the table's cells.
pub fn traced(header: &[Vec<String>], columns: &[String], rows: &[Vec<String>]) -> String {
    let mut out = String::new();
    for row in header {
        let fields: Vec<String> = row.iter().map(|cell| field(cell)).collect();
        out.push_str(&fields.join(","));
        out.push_str("\r\n");
    }
    if !header.is_empty() {
        out.push_str("\r\n");
    }
    out.push_str(&table(columns, rows));
    out
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn plain_numbers_stay_numbers() {
        for number in [
            "-12.5", "12.5", "+3", "0", "-0.001", ".5", "-.5", "1.2e-5", "-4E+3", "145.04",
        ] {
            assert!(is_plain_number(number), "{number}");
            assert_eq!(neutralise(number), number, "{number}");
            assert_eq!(field(number), number, "{number}");
        }
        for not_number in [
            "-", "+", "-e5", "1e", "1.2.3", "-1+1", "-inf", "-NaN", "1,5", "-12.5 kN", "12 ",
        ] {
            assert!(!is_plain_number(not_number), "{not_number}");
        }
    }

    #[test]
    fn every_formula_start_gets_an_apostrophe() {
        let cases = [
            ("=1+1", "'=1+1"),
            ("+A1", "'+A1"),
            ("-1+cmd|'/C calc'!A0", "'-1+cmd|'/C calc'!A0"),
            ("@SUM(A1:A9)", "'@SUM(A1:A9)"),
            ("\t=1", "'\t'=1"),
            ("\r=1", "'\r'=1"),
            ("-12.5 kN", "'-12.5 kN"),
            ("＝1+1", "'＝1+1"),
            ("－1+1", "'－1+1"),
            ("x;=cmd", "x;'=cmd"),
            ("x,=cmd", "x,'=cmd"),
            ("x\t=cmd", "x\t'=cmd"),
            ("x\n@cmd", "x\n'@cmd"),
            ("a;-1+1;b,+c", "a;'-1+1;b,'+c"),
            ("a;-12.5", "a;-12.5"),
            ("=a;=b", "'=a;'=b"),
        ];
        for (cell, expected) in cases {
            assert_eq!(neutralise(cell), expected, "{cell:?}");
        }
    }

    #[test]
    fn safe_cells_are_unchanged() {
        for cell in [
            "B1",
            "bend 90°",
            "Thrust on the supports",
            "1,500",
            "a - b",
            "x = y",
            "",
            "'quoted",
            "é;é",
        ] {
            assert_eq!(neutralise(cell), cell, "{cell:?}");
        }
    }

    #[test]
    fn fields_are_quoted_as_rfc_4180_says() {
        assert_eq!(field("a,b"), "\"a,b\"");
        assert_eq!(field("say \"hi\""), "\"say \"\"hi\"\"\"");
        assert_eq!(field("two\r\nlines"), "\"two\r\nlines\"");
        assert_eq!(field("a;b"), "\"a;b\"");
        assert_eq!(field("x;=cmd"), "\"x;'=cmd\"");
        assert_eq!(field("plain"), "plain");
        let text = table(
            &["tag".to_string(), "thrust (kN)".to_string()],
            &[vec!["=HYPERLINK(\"x\")".to_string(), "-12.5".to_string()]],
        );
        assert_eq!(text, "tag,thrust (kN)\r\n\"'=HYPERLINK(\"\"x\"\")\",-12.5\r\n");
    }

    #[test]
    fn a_traced_table_starts_with_its_header_block() {
        let header = vec![
            vec!["Fluxledger".to_string(), "0.1.0".to_string()],
            vec![
                "Link".to_string(),
                "https://x.example/bend.html?p=10bar&tag==cmd".to_string(),
            ],
            vec![
                "Input".to_string(),
                "Pressure".to_string(),
                "10".to_string(),
                "bar".to_string(),
            ],
        ];
        let text = traced(&header, &["a".to_string()], &[vec!["-1".to_string()]]);
        assert_eq!(
            text,
            "Fluxledger,0.1.0\r\nLink,https://x.example/bend.html?p=10bar&tag==cmd\r\nInput,Pressure,10,bar\r\n\r\na\r\n-1\r\n"
        );
        let risky = traced(&[vec!["Project".to_string(), "=cmd".to_string()]], &[], &[]);
        assert!(risky.starts_with("Project,'=cmd\r\n\r\n"), "{risky:?}");
        assert_eq!(traced(&[], &["a".to_string()], &[]), "a\r\n");
    }
}
