//! The writers checked on a small presentation, held and streamed.

use super::*;
use std::io::Write;

fn sample() -> Presentation {
    let mut s = Sheet::new("t", &["name", "x"]);
    s.rows.push(vec![Cell::Text("a".into()), Cell::Num(1.23456, 2)]);
    s.rows.push(vec![Cell::Text("bb".into()), Cell::Empty]);
    Presentation {
        json: serde_json::json!({"a": 1}),
        sheets: vec![s],
        main_sheet: 0,
        notes: vec!["hello".into()],
        cautions: vec![],
    }
}

/// The three forms of a presentation: (text, csv stdout, csv stderr, json).
fn written(p: &Presentation) -> (String, String, String, String) {
    let (mut t, mut c, mut e, mut j) = (Vec::new(), Vec::new(), Vec::new(), Vec::new());
    write_text(p, &mut t).unwrap();
    write_csv(p, &mut c, &mut e).unwrap();
    write_json(&p.json, &mut j).unwrap();
    let s = |v: Vec<u8>| String::from_utf8(v).unwrap();
    (s(t), s(c), s(e), s(j))
}

#[test]
fn three_writers() {
    let (text, csv, err, json) = written(&sample());
    assert_eq!(csv, "name,x\na,1.23456\nbb,\n");
    assert_eq!(err, "note: hello\n");
    assert_eq!(text, "t\n  name     x\n  a     1.23\n  bb       -\n\nhello\n");
    assert_eq!(json, "{\n  \"a\": 1\n}\n");
    assert_eq!(jnum(Some(f64::INFINITY)), serde_json::Value::String("inf".into()));
    assert_eq!(jnum(Some(f64::NAN)), serde_json::Value::Null);
}

#[test]
fn cautions_follow_the_notes() {
    let mut p = sample();
    p.cautions.push("not a forecast".into());
    let (text, _, err, _) = written(&p);
    assert!(text.ends_with("\nhello\nnot a forecast\n"), "{text}");
    assert_eq!(err, "note: hello\nnote: not a forecast\n");
}

/// A presentation produced row by row, holding the same content as `sample()`.
struct Produced(Presentation);

impl Streamed for Produced {
    fn head(&self) -> &Sheet {
        &self.0.sheets[0]
    }
    fn each_row(&self, f: &mut dyn FnMut(&[Cell]) -> std::io::Result<()>) -> std::io::Result<()> {
        self.0.sheets[0].rows.iter().try_for_each(|r| f(r))
    }
    fn each_note(&self, f: &mut dyn FnMut(&str) -> std::io::Result<()>) -> std::io::Result<()> {
        self.0.each_note(f)
    }
    fn write_json(&self, out: &mut dyn Write) -> std::io::Result<()> {
        write_json(&self.0.json, out)
    }
}

#[test]
fn streamed_presentations_are_written_as_held_ones() {
    let mut p = sample();
    p.sheets[0].rows.push(vec![Cell::Text("c".into()), Cell::Num(f64::INFINITY, 1)]);
    p.sheets[0].rows.push(vec![Cell::Text("dd".into()), Cell::Num(-0.0, 3)]);
    p.sheets[0].rows.push(vec![Cell::Text("e".into()), Cell::Int(7)]);
    for notes in [vec![], vec!["one".to_string(), "two".to_string()]] {
        p.notes = notes;
        let held = written(&p);
        let s = Produced(p.clone());
        let (mut t, mut c, mut e, mut j) = (Vec::new(), Vec::new(), Vec::new(), Vec::new());
        write_streamed_text(&s, &mut t).unwrap();
        write_streamed_csv(&s, &mut c, &mut e).unwrap();
        s.write_json(&mut j).unwrap();
        let st = |v: Vec<u8>| String::from_utf8(v).unwrap();
        assert_eq!(held, (st(t), st(c), st(e), st(j)));
    }
    // Width from every row (including the later `inf`), a negative zero written without its sign
    // (0.000 in text, 0 in CSV), notes after a blank line.
    let (text, csv, err, _) = written(&p);
    assert_eq!(
        text,
        "t\n  name      x\n  a      1.23\n  bb        -\n  c       inf\n  dd    0.000\n  e         7\n\none\ntwo\n"
    );
    assert_eq!(csv, "name,x\na,1.23456\nbb,\nc,inf\ndd,0\ne,7\n");
    assert_eq!(err, "note: one\nnote: two\n");
    p.notes.clear();
    assert!(!written(&p).0.ends_with("\n\n"), "no blank line without notes");
}

#[test]
fn json_views_write_numbers_as_jnum_does() {
    #[derive(serde::Serialize)]
    struct View {
        #[serde(serialize_with = "json_num::one")]
        a: f64,
        #[serde(serialize_with = "json_num::one")]
        b: f64,
        #[serde(serialize_with = "json_num::opt")]
        c: Option<f64>,
        #[serde(serialize_with = "json_num::opt")]
        d: Option<f64>,
    }
    let v = serde_json::to_value(View { a: 1.5, b: f64::NEG_INFINITY, c: Some(f64::NAN), d: None }).unwrap();
    assert_eq!(v, serde_json::json!({"a": jnum(Some(1.5)), "b": "-inf", "c": null, "d": null}));
}
