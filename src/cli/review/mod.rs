//! `lodestone review DIR`: a local page to review and set each specimen's fit (contract, "Review
//! page"). Served on 127.0.0.1 only; every request needs the run's random key and a Host of
//! 127.0.0.1:PORT or localhost:PORT; the page and its script and style are embedded (no network).

mod api;

use super::{Ctx, Presentation};
use anyhow::{anyhow, bail, Result};
use clap::Args;
use rand::RngExt;
use std::io::{Read, Write};
use std::path::PathBuf;

/// The page, with its script and style inline.
const PAGE: &str = include_str!("page.html");
/// Largest request body accepted, bytes.
const MAX_BODY: u64 = 64 * 1024;

#[derive(Debug, Args)]
pub struct ReviewArgs {
    /// Project folder (steps.csv, sampling.csv; picks.csv and settings.toml if present).
    pub dir: PathBuf,
    /// Port on 127.0.0.1 (0: any free port).
    #[arg(long, default_value_t = 0)]
    pub port: u16,
    /// Open the page in the desktop's browser (xdg-open).
    #[arg(long)]
    pub open: bool,
}

/// Whether a request may be answered: the right key and an allowed Host.
struct Gate {
    key: String,
    hosts: [String; 2],
}

impl Gate {
    fn allows(&self, req: &tiny_http::Request) -> bool {
        let header = |name: &str| {
            req.headers()
                .iter()
                .find(|h| h.field.as_str().as_str().eq_ignore_ascii_case(name))
                .map(|h| h.value.as_str())
        };
        let host_ok = header("host").is_some_and(|h| self.hosts.iter().any(|a| a == h));
        let query_key = req
            .url()
            .split_once('?')
            .and_then(|(_, q)| q.split('&').find_map(|kv| kv.strip_prefix("key=")))
            .map(str::to_string);
        let given = header("x-lodestone-key").map(str::to_string).or(query_key);
        host_ok && given.is_some_and(|k| same(k.as_bytes(), self.key.as_bytes()))
    }
}

/// Comparison whose time does not depend on where the strings first differ.
fn same(a: &[u8], b: &[u8]) -> bool {
    a.len() == b.len() && a.iter().zip(b).fold(0u8, |acc, (x, y)| acc | (x ^ y)) == 0
}

fn respond(req: tiny_http::Request, reply: api::Reply) {
    let headers = [
        ("Content-Type", reply.content_type),
        ("Cache-Control", "no-store"),
        ("X-Content-Type-Options", "nosniff"),
        ("Referrer-Policy", "no-referrer"),
        (
            "Content-Security-Policy",
            "default-src 'none'; script-src 'unsafe-inline'; style-src 'unsafe-inline'; connect-src 'self'",
        ),
    ];
    let mut r = tiny_http::Response::from_data(reply.body).with_status_code(reply.status);
    for (k, v) in headers {
        if let Ok(h) = tiny_http::Header::from_bytes(k.as_bytes(), v.as_bytes()) {
            r.add_header(h);
        }
    }
    let _ = req.respond(r);
}

fn forbidden() -> api::Reply {
    api::Reply { status: 403, content_type: "text/plain; charset=utf-8", body: b"forbidden\n".to_vec() }
}

fn serve_one(mut req: tiny_http::Request, gate: &Gate, state: &mut api::State) {
    if !gate.allows(&req) {
        return respond(req, forbidden());
    }
    let method = req.method().as_str().to_string();
    let path = req.url().split('?').next().unwrap_or("/").to_string();
    let mut body = Vec::new();
    if req.as_reader().take(MAX_BODY + 1).read_to_end(&mut body).is_err() || body.len() as u64 > MAX_BODY {
        let r =
            api::Reply { status: 400, content_type: "text/plain; charset=utf-8", body: b"body too large\n".to_vec() };
        return respond(req, r);
    }
    let reply = if method == "GET" && (path == "/" || path == "/index.html") {
        api::Reply { status: 200, content_type: "text/html; charset=utf-8", body: PAGE.as_bytes().to_vec() }
    } else {
        state.handle(&method, &path, &body)
    };
    respond(req, reply)
}

pub fn run(a: ReviewArgs, _ctx: &mut Ctx) -> Result<Presentation> {
    if !a.dir.is_dir() {
        bail!("{}: not a folder (a project folder holds steps.csv and sampling.csv)", a.dir.display());
    }
    let dir = std::fs::canonicalize(&a.dir)?;
    let mut state = api::State::load(&dir)?;
    let server = tiny_http::Server::http(("127.0.0.1", a.port))
        .map_err(|e| anyhow!("cannot listen on 127.0.0.1:{}: {e}", a.port))?;
    let port = server.server_addr().to_ip().map(|s| s.port()).ok_or_else(|| anyhow!("no TCP port"))?;
    let key: String = {
        let mut rng = rand::rng();
        (0..4).map(|_| format!("{:016x}", rng.random::<u64>())).collect()
    };
    let gate = Gate { key: key.clone(), hosts: [format!("127.0.0.1:{port}"), format!("localhost:{port}")] };
    let url = format!("http://127.0.0.1:{port}/?key={key}");
    {
        let mut out = std::io::stdout().lock();
        writeln!(out, "review: {url}")?;
        out.flush()?;
    }
    eprintln!(
        "Serving {} on 127.0.0.1:{port} (this machine only); picks are saved to {}. Stop with Ctrl-C.",
        dir.display(),
        dir.join(lodestone::simulate::PICKS_FILE).display()
    );
    if a.open {
        if let Err(e) = std::process::Command::new("xdg-open").arg(&url).spawn() {
            eprintln!("could not open a browser ({e}); open the address above by hand");
        }
    }
    for req in server.incoming_requests() {
        serve_one(req, &gate, &mut state);
    }
    bail!("the server stopped")
}
