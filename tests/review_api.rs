//! The review page's HTTP API, driven over a real socket: the key and Host checks, the refusals
//! (each writes nothing), and the atomic save of picks.csv.

use std::io::{BufRead, BufReader, Read, Write};
use std::net::TcpStream;
use std::path::{Path, PathBuf};
use std::process::{Child, Command, Stdio};

struct Server {
    child: Child,
    port: u16,
    key: String,
    dir: tempfile::TempDir,
}

impl Drop for Server {
    fn drop(&mut self) {
        let _ = self.child.kill();
        let _ = self.child.wait();
    }
}

/// A copy of the demo project's inputs (no picks) in a fresh folder, served by `lodestone review`.
fn start() -> Server {
    start_with(None)
}

/// As [`start`], with a picks.csv of this text in the folder first.
fn start_with(picks: Option<&str>) -> Server {
    let dir = tempfile::tempdir().unwrap();
    let demo = Path::new(env!("CARGO_MANIFEST_DIR")).join("records/demo");
    for f in ["steps.csv", "sampling.csv", "settings.toml"] {
        std::fs::copy(demo.join(f), dir.path().join(f)).unwrap();
    }
    if let Some(text) = picks {
        std::fs::write(dir.path().join("picks.csv"), text).unwrap();
    }
    let mut child = Command::new(env!("CARGO_BIN_EXE_lodestone"))
        .args(["review", dir.path().to_str().unwrap()])
        .stdout(Stdio::piped())
        .stderr(Stdio::null())
        .spawn()
        .unwrap();
    let mut line = String::new();
    BufReader::new(child.stdout.take().unwrap()).read_line(&mut line).unwrap();
    // Contract: the first stdout line is `review: http://127.0.0.1:PORT/?key=KEY`.
    let rest = line.trim().strip_prefix("review: http://127.0.0.1:").expect("first line names the address");
    let (port, key) = rest.split_once("/?key=").unwrap();
    assert!(key.len() >= 32 && key.chars().all(|c| c.is_ascii_hexdigit()), "key {key}");
    Server { child, port: port.parse().unwrap(), key: key.to_string(), dir }
}

/// One HTTP/1.0 request (a plain body, no chunks); returns (status, body).
fn request(s: &Server, method: &str, target: &str, host: &str, key: Option<&str>, body: &str) -> (u16, String) {
    let mut c = TcpStream::connect(("127.0.0.1", s.port)).unwrap();
    let mut req = format!("{method} {target} HTTP/1.0\r\nHost: {host}\r\nConnection: close\r\n");
    if let Some(k) = key {
        req.push_str(&format!("x-lodestone-key: {k}\r\n"));
    }
    req.push_str(&format!("Content-Length: {}\r\n\r\n{body}", body.len()));
    c.write_all(req.as_bytes()).unwrap();
    let mut out = String::new();
    c.read_to_string(&mut out).unwrap();
    let status = out.split(' ').nth(1).unwrap().parse().unwrap();
    let body = out.split_once("\r\n\r\n").map(|(_, b)| b.to_string()).unwrap_or_default();
    (status, body)
}

fn call(s: &Server, method: &str, target: &str, body: &str) -> (u16, String) {
    request(s, method, target, &format!("127.0.0.1:{}", s.port), Some(&s.key), body)
}

fn listing(dir: &Path) -> Vec<PathBuf> {
    let mut v: Vec<_> = std::fs::read_dir(dir).unwrap().map(|e| e.unwrap().path()).collect();
    v.sort();
    v
}

fn json(body: &str) -> serde_json::Value {
    serde_json::from_str(body).unwrap_or_else(|e| panic!("{e}: {body}"))
}

#[test]
fn key_and_host_are_required() {
    let s = start();
    let host = format!("127.0.0.1:{}", s.port);
    let local = format!("localhost:{}", s.port);
    assert_eq!(request(&s, "GET", "/api/specimens", &host, None, "").0, 403, "no key");
    assert_eq!(request(&s, "GET", "/api/specimens", &host, Some("0123abcd"), "").0, 403, "wrong key");
    let wrong_len = format!("{}0", s.key);
    assert_eq!(request(&s, "GET", "/api/specimens", &host, Some(&wrong_len), "").0, 403, "key with a char more");
    assert_eq!(request(&s, "GET", "/", &host, None, "").0, 403, "page without key");
    // A page on another origin that resolves to 127.0.0.1 (DNS rebinding) sends its own Host.
    let evil = format!("attacker.example:{}", s.port);
    assert_eq!(request(&s, "GET", "/api/specimens", &evil, Some(&s.key), "").0, 403, "foreign host");
    assert_eq!(request(&s, "GET", "/api/specimens", "127.0.0.1", Some(&s.key), "").0, 403, "host without port");
    assert_eq!(request(&s, "GET", "/api/specimens", &host, Some(&s.key), "").0, 200);
    assert_eq!(request(&s, "GET", "/api/specimens", &local, Some(&s.key), "").0, 200);
    let q = format!("/api/specimens?key={}", s.key);
    assert_eq!(request(&s, "GET", &q, &host, None, "").0, 200, "key in the query");
    let (st, page) = request(&s, "GET", &format!("/?key={}", s.key), &host, None, "");
    assert_eq!(st, 200);
    // Everything the page needs is inline: no external script, style or address.
    assert!(page.contains("<script>") && page.contains("<style>"));
    assert!(!page.contains("src=\"http") && !page.contains("href=\"http") && !page.contains("<link"));
}

#[test]
fn nothing_outside_the_folder_is_served() {
    let s = start();
    for p in ["/../../../../etc/passwd", "/steps.csv", "/%2e%2e/%2e%2e/etc/hostname", "/api/../steps.csv"] {
        let (st, body) = call(&s, "GET", p, "");
        assert_eq!(st, 404, "{p}");
        assert!(!body.contains("root:") && !body.contains("specimen,site"), "{p}: {body}");
    }
}

#[test]
fn specimens_and_preview_fits() {
    let s = start();
    let before = listing(s.dir.path());
    let (st, body) = call(&s, "GET", "/api/specimens", "");
    assert_eq!(st, 200);
    let list = json(&body);
    let list = list.as_array().unwrap();
    assert_eq!(list.len(), 192); // 48 levels × 4 specimens (records/demo/README.md)
    let first = &list[0];
    assert_eq!(first["specimen"], "SG001-1");
    assert_eq!(first["n_steps"], 12);
    assert!(first["fit"]["dec"].is_number() && first["fit"]["mad"].is_number());
    let (st, body) =
        call(&s, "POST", "/api/fit", r#"{"specimen":"SG001-1","from":300,"to":560,"kind":"line","anchor":"free"}"#);
    assert_eq!(st, 200, "{body}");
    let f = json(&body);
    assert_eq!(f["n_steps"], 7);
    for k in ["dec", "inc", "mad", "dang"] {
        assert!(f[k].is_number(), "{k}");
    }
    // The page's fit is the `components` verb's fit of the same range, field for field and byte for
    // byte (one view of a fit in the library).
    let verb = Command::new(env!("CARGO_BIN_EXE_lodestone"))
        .args(["components", "--from", "300", "--to", "560", "--format", "json"])
        .arg(s.dir.path().join("steps.csv"))
        .output()
        .unwrap();
    assert!(verb.status.success(), "{}", String::from_utf8_lossy(&verb.stderr));
    let verb: serde_json::Value = serde_json::from_slice(&verb.stdout).unwrap();
    let same = verb["fits"].as_array().unwrap().iter().find(|x| x["specimen"] == "SG001-1").unwrap();
    let obj = f.as_object().unwrap();
    assert_eq!(obj.len(), 9, "{body}");
    for (k, v) in obj {
        assert_eq!(v.to_string(), same[k].to_string(), "{k}");
    }
    let (st, body) =
        call(&s, "POST", "/api/fit", r#"{"specimen":"SG001-1","from":0,"to":560,"kind":"plane","anchor":"origin"}"#);
    assert_eq!(st, 200, "{body}");
    assert_eq!(json(&body)["kind"], "plane");
    assert_eq!(listing(s.dir.path()), before, "a preview writes nothing");
}

#[test]
fn refusals_write_nothing() {
    let s = start();
    let before = listing(s.dir.path());
    let cases = [
        ("POST", "/api/fit", "{not json"),
        ("POST", "/api/fit", r#"{"specimen":"NOPE-1","from":300,"to":560}"#),
        ("POST", "/api/fit", r#"{"specimen":"SG001-1","from":310,"to":560}"#),
        ("POST", "/api/fit", r#"{"specimen":"SG001-1","from":300,"to":600}"#),
        ("POST", "/api/fit", r#"{"specimen":"SG001-1","from":560,"to":300}"#),
        ("POST", "/api/fit", r#"{"specimen":"SG001-1","from":530,"to":560,"kind":"plane"}"#),
        ("POST", "/api/fit", r#"{"specimen":"SG001-1","from":300,"to":560,"kind":"circle"}"#),
        ("PUT", "/api/picks/SG001-1", "[1,2"),
        ("PUT", "/api/picks/SG001-1", r#"{"from":"300","to":560}"#),
        ("PUT", "/api/picks/NOPE-1", r#"{"from":300,"to":560}"#),
        ("PUT", "/api/picks/SG001-1", r#"{"from":305,"to":560}"#),
        ("PUT", "/api/picks/SG001-1", r#"{"from":300,"to":560,"anchor":"centre"}"#),
        ("DELETE", "/api/picks/NOPE-1", ""),
    ];
    for (m, p, b) in cases {
        let (st, body) = call(&s, m, p, b);
        assert_eq!(st, 400, "{m} {p} {b}: {body}");
        assert!(json(&body)["error"].as_str().is_some_and(|e| !e.is_empty()), "a message: {body}");
        assert_eq!(listing(s.dir.path()), before, "{m} {p} {b} wrote something");
    }
}

#[test]
fn saving_is_atomic_and_keeps_one_backup() {
    use std::os::unix::fs::MetadataExt;
    let original = "specimen,from,to\nSG003-1,300,560\n";
    let s = start_with(Some(original));
    let picks = s.dir.path().join("picks.csv");
    let (st, saved) = call(&s, "PUT", "/api/picks/SG001-1", r#"{"from":300,"to":560,"kind":"line","anchor":"origin"}"#);
    assert_eq!(st, 200, "{saved}");
    let (_, preview) =
        call(&s, "POST", "/api/fit", r#"{"specimen":"SG001-1","from":300,"to":560,"kind":"line","anchor":"origin"}"#);
    assert_eq!(json(&saved), json(&preview), "the saved fit is the previewed fit");
    let first = std::fs::read_to_string(&picks).unwrap();
    assert_eq!(first, "specimen,from,to,kind,anchor\nSG001-1,300,560,line,origin\nSG003-1,300,560,line,free\n");
    // The backup is the file as it was before this run's first save.
    assert_eq!(std::fs::read_to_string(s.dir.path().join("picks.csv.bak")).unwrap(), original);
    // A hard link keeps the old file's inode: a save by temporary file and rename leaves it unchanged,
    // an in-place rewrite would change it.
    let link = s.dir.path().join("old-picks-link");
    std::fs::hard_link(&picks, &link).unwrap();
    let ino = std::fs::metadata(&picks).unwrap().ino();
    let (st, _) = call(&s, "PUT", "/api/picks/SG002-2", r#"{"from":250,"to":560,"kind":"plane","anchor":"free"}"#);
    assert_eq!(st, 200);
    assert_ne!(std::fs::metadata(&picks).unwrap().ino(), ino, "replaced by rename");
    assert_eq!(std::fs::read_to_string(&link).unwrap(), first, "the old file was not written in place");
    let second = std::fs::read_to_string(&picks).unwrap();
    assert_eq!(
        second,
        "specimen,from,to,kind,anchor\nSG001-1,300,560,line,origin\nSG002-2,250,560,plane,free\nSG003-1,300,560,line,free\n"
    );
    let (st, _) = call(&s, "PUT", "/api/picks/SG001-1", r#"{"from":350,"to":560}"#);
    assert_eq!(st, 200);
    assert_eq!(std::fs::read_to_string(s.dir.path().join("picks.csv.bak")).unwrap(), original, "backup kept once");
    let leftovers: Vec<_> = listing(s.dir.path())
        .into_iter()
        .filter(|p| p.file_name().unwrap().to_string_lossy().contains(".tmp"))
        .collect();
    assert!(leftovers.is_empty(), "{leftovers:?}");
    // The saved table is a valid picks table for `components`.
    let out = Command::new(env!("CARGO_BIN_EXE_lodestone"))
        .args(["components", s.dir.path().join("steps.csv").to_str().unwrap(), "--picks"])
        .arg(&picks)
        .args(["--format", "csv"])
        .output()
        .unwrap();
    assert!(out.status.success(), "{}", String::from_utf8_lossy(&out.stderr));
    assert_eq!(String::from_utf8_lossy(&out.stdout).lines().count(), 4, "a header and three fits");
    // Back to the automatic rule.
    let (st, body) = call(&s, "DELETE", "/api/picks/SG002-2", "");
    assert_eq!(st, 200, "{body}");
    let (_, list) = call(&s, "GET", "/api/specimens", "");
    let list = json(&list);
    let sg = list.as_array().unwrap().iter().find(|x| x["specimen"] == "SG002-2").unwrap();
    assert_eq!(sg["source"], "auto");
    assert!(!std::fs::read_to_string(&picks).unwrap().contains("SG002-2"));
}

#[test]
fn effect_of_the_picks_on_site_means_and_field_tests() {
    let s = start();
    let before = listing(s.dir.path());
    let (st, body) = call(&s, "GET", "/api/effect", "");
    assert_eq!(st, 200, "{body}");
    let v = json(&body);
    let names: Vec<&str> = v["stages"].as_array().unwrap().iter().map(|x| x["name"].as_str().unwrap()).collect();
    assert_eq!(names, ["Characteristic components", "Site means", "Field tests"]);
    let tests = v["stages"][2]["result"].as_str().unwrap();
    assert!(tests.contains("Reversal test"), "{tests}");
    assert_eq!(listing(s.dir.path()), before, "the re-run writes nothing");
}
