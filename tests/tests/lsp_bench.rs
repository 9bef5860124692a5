//! A benchmark of the language server, not a timed test: it is ignored by default and prints
//! its figures. On a generated file of 1,000 planets it measures the time from `didChange` to
//! `publishDiagnostics`, hover latency (medians and 95th percentiles) and the server's memory.
//!
//! ```sh
//! cargo test -p syzygy-e2e --test e2e lsp_bench -- --ignored --nocapture
//! ```

#![allow(clippy::unwrap_used, clippy::indexing_slicing)]

use serde_json::json;
use std::fmt::Write as _;
use std::time::{Duration, Instant};
use syzygy_e2e::lsp::{position_of, LspClient};

/// 1,000 planets: 125 systems of one star and eight planets each.
fn generated() -> String {
    let mut s = String::from("ref gen \"Generated benchmark data (invented)\"\n");
    for i in 0..125 {
        let _ = writeln!(s, "system \"Bench {i}\" {{");
        let _ = writeln!(
            s,
            "  star s{i} {{\n    mass   = {:.2} ± 0.04 Msun [gen]\n    radius = {:.2} ± 0.02 Rsun\n    teff   = {} ± 80 K\n  }}",
            0.7 + (i % 7) as f64 * 0.05,
            0.7 + (i % 5) as f64 * 0.05,
            4800 + (i % 9) * 60
        );
        for p in 0..8 {
            let period = 2.0 * 1.9f64.powi(p);
            let _ = writeln!(
                s,
                "  planet p{i}_{p} orbits s{i} {{\n    period        = {period:.4} ± 0.0005 d [gen]\n    rv_amplitude  = {:.1} ± 0.8 m/s\n    transit_depth = {:.3} ± 0.01 %\n    impact        = 0.3 ± 0.05\n  }}",
                30.0 / (p + 1) as f64,
                0.3 + 0.05 * p as f64
            );
        }
        s.push_str("}\n");
    }
    s
}

fn percentile(sorted: &[Duration], p: f64) -> Duration {
    let i = ((sorted.len() as f64 - 1.0) * p).round() as usize;
    sorted[i.min(sorted.len() - 1)]
}

fn rss_mib(pid: u32, field: &str) -> f64 {
    let status = std::fs::read_to_string(format!("/proc/{pid}/status")).unwrap_or_default();
    status
        .lines()
        .find(|l| l.starts_with(field))
        .and_then(|l| l.split_whitespace().nth(1))
        .and_then(|kb| kb.parse::<f64>().ok())
        .map_or(f64::NAN, |kb| kb / 1024.0)
}

#[test]
#[ignore = "benchmark: run with --ignored --nocapture"]
fn language_server_on_1000_planets() {
    let text = generated();
    let uri = "file:///tmp/bench-1000.syz";
    let mut c = LspClient::start();
    c.initialize(json!({}));
    let t = Instant::now();
    c.open(uri, &text);
    let d = c.diagnostics(uri, Some(1));
    let first = t.elapsed();
    assert_eq!(d["diagnostics"], json!([]), "the generated file is clean");

    // didChange → publishDiagnostics: alternate a period digit so every change is real.
    let rounds = 30;
    let mut change_times = Vec::new();
    for r in 0..rounds {
        let version = 2 + r as i64;
        let pos = position_of(&text, "period        = ", 500);
        let at = json!({"line": pos["line"], "character": pos["character"].as_u64().unwrap() + 16});
        let end =
            json!({"line": pos["line"], "character": pos["character"].as_u64().unwrap() + 17});
        let digit = if r % 2 == 0 { "3" } else { "2" };
        let t = Instant::now();
        c.notify(
            "textDocument/didChange",
            json!({"textDocument": {"uri": uri, "version": version},
                   "contentChanges": [{"range": {"start": at, "end": end}, "text": digit}]}),
        );
        c.diagnostics(uri, Some(version));
        change_times.push(t.elapsed());
    }
    // The same, typing that moves the later systems: insert a digit, then delete it again
    // (about half of the 125 systems come after the edit).
    let mut moving_times = Vec::new();
    for r in 0..rounds {
        let version = 2 + rounds as i64 + r as i64;
        let pos = position_of(&text, "period        = ", 500);
        let at = json!({"line": pos["line"], "character": pos["character"].as_u64().unwrap() + 16});
        let end =
            json!({"line": pos["line"], "character": pos["character"].as_u64().unwrap() + 17});
        let change = if r % 2 == 0 {
            json!({"range": {"start": at, "end": at}, "text": "1"})
        } else {
            json!({"range": {"start": at, "end": end}, "text": ""})
        };
        let t = Instant::now();
        c.notify(
            "textDocument/didChange",
            json!({"textDocument": {"uri": uri, "version": version},
                   "contentChanges": [change]}),
        );
        c.diagnostics(uri, Some(version));
        moving_times.push(t.elapsed());
    }
    // Hover on a settled document.
    let mut hover_times = Vec::new();
    for k in 0..200 {
        let pos = position_of(&text, "period", k * 5);
        let t = Instant::now();
        let r = c.result(
            "textDocument/hover",
            json!({"textDocument": {"uri": uri}, "position": pos}),
        );
        hover_times.push(t.elapsed());
        assert!(r["contents"]["value"]
            .as_str()
            .unwrap()
            .contains("Orbital period"));
    }
    let rss = rss_mib(c.pid(), "VmRSS:");
    let peak = rss_mib(c.pid(), "VmHWM:");
    change_times.sort();
    moving_times.sort();
    hover_times.sort();
    let ms = |d: Duration| d.as_secs_f64() * 1000.0;
    println!(
        "file: {} bytes, {} lines, 1000 planets\nfirst diagnostics after didOpen: {:.1} ms\n\
         didChange -> publishDiagnostics ({rounds} changes): median {:.1} ms, p95 {:.1} ms\n\
         the same, inserting and deleting (later systems move): median {:.1} ms, p95 {:.1} ms\n\
         hover (200 requests): median {:.2} ms, p95 {:.2} ms\n\
         memory: resident {rss:.0} MiB, peak {peak:.0} MiB",
        text.len(),
        text.lines().count(),
        ms(first),
        ms(percentile(&change_times, 0.5)),
        ms(percentile(&change_times, 0.95)),
        ms(percentile(&moving_times, 0.5)),
        ms(percentile(&moving_times, 0.95)),
        ms(percentile(&hover_times, 0.5)),
        ms(percentile(&hover_times, 0.95)),
    );
    assert_eq!(c.shutdown_and_exit().unwrap().code(), Some(0));
}
