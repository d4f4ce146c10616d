use super::*;
use crate::model::{DirectionKind, StratAxis};

fn parse(s: &str) -> Result<Table, crate::error::TableError> {
    Table::parse("t.csv", s.as_bytes())
}

#[test]
fn bom_crlf_comments_and_header_case() {
    let t = parse("\u{feff}# a comment\r\n Dec , INC,Site\r\n# another\r\n10,20,a\r\n\r\n30,40,b\r\n").unwrap();
    assert_eq!(t.headers, vec!["dec", "inc", "site"]);
    assert_eq!(t.header_line, 2);
    assert_eq!(t.rows.len(), 2);
    assert_eq!(t.rows[0].line, 4);
    assert_eq!(t.rows[1].line, 6);
    assert_eq!(t.rows[1].cells, vec!["30", "40", "b"]);
}

#[test]
fn errors_name_file_line_and_column() {
    let t = parse("dec,inc\n10,20\n10,95.2\n").unwrap();
    let e = read_directions(&t, &GroupBy::Default).unwrap_err();
    assert_eq!(e.to_string(), "t.csv:3: column 'inc': 95.2 is outside [-90, 90]");
    let t = parse("dec,inc\n10,abc\n").unwrap();
    assert_eq!(
        read_directions(&t, &GroupBy::Default).unwrap_err().to_string(),
        "t.csv:2: column 'inc': 'abc' is not a number"
    );
    let t = parse("dec,inc\n10,NaN\n").unwrap();
    assert!(read_directions(&t, &GroupBy::Default).unwrap_err().to_string().contains("not a finite number"));
    let t = parse("dec,site\n10,a\n").unwrap();
    let e = read_directions(&t, &GroupBy::Default).unwrap_err();
    assert_eq!((e.line, e.column.as_deref()), (1, Some("inc")));
    assert!(parse("").unwrap_err().to_string().starts_with("t.csv:1: the file is empty"));
    assert!(read_directions(&parse("dec,inc\n").unwrap(), &GroupBy::Default)
        .unwrap_err()
        .to_string()
        .contains("no data rows"));
    assert!(parse("dec,inc,dec\n1,2,3\n").unwrap_err().to_string().contains("column 'dec': the column appears twice"));
    assert_eq!(parse("dec,inc\n1\n").unwrap_err().line, 2);
}

#[test]
fn typed_directions_with_bedding_and_groups() {
    let t = parse("site,dec,inc,bed_strike,bed_dip,height,kind\nA,-10,30,0,20,1.5,plane\nB,360,30,,,2,\n").unwrap();
    let s = read_directions(&t, &GroupBy::Default).unwrap();
    assert_eq!(s.axis, Some(StratAxis::Height));
    assert_eq!(s.records[0].direction.dec, 350.0);
    assert_eq!(s.records[0].bedding.unwrap().dip_dir, 90.0);
    assert_eq!(s.records[0].kind, DirectionKind::Plane);
    assert_eq!(s.records[1].direction.dec, 0.0);
    assert_eq!(s.records[1].group.as_deref(), Some("B"));
    let e = read_directions(&t, &GroupBy::Column("lith".into())).unwrap_err();
    assert_eq!(e.column.as_deref(), Some("lith"));
    assert!(read_directions(&parse("dec,inc,height,depth\n1,2,3,4\n").unwrap(), &GroupBy::Default).is_err());
    assert!(read_directions(&parse("dec,inc,bed_dip\n1,2,30\n").unwrap(), &GroupBy::Default).is_err());
}
