//! `syz ephemeris`: upcoming mid-transit times of one planet.

use crate::files;
use syzygy::ephemeris::Ephemeris;
use syzygy::time;

#[derive(clap::Args)]
#[command(
    after_help = "Examples:\n  syz ephemeris examples/veyra.syz b\n  syz ephemeris examples/veyra.syz b --from 2027-01-01 --count 5\n  syz ephemeris examples/veyra.syz b --from 2461400.5   # a JD in UTC"
)]
pub struct Args {
    pub file: std::path::PathBuf,
    /// The planet.
    pub body: String,
    /// List transits from this moment: an ISO 8601 UTC date or timestamp
    /// (2027-01-01, 2027-01-01T18:00:00Z) or a Julian date in UTC. Default: now.
    #[arg(long)]
    pub from: Option<String>,
    /// How many transits to list.
    #[arg(long, default_value_t = 10, value_parser = clap::value_parser!(u32).range(1..=10_000))]
    pub count: u32,
    /// The system, when several systems of the file have a body of that name.
    #[arg(long)]
    pub system: Option<String>,
    /// Output format.
    #[arg(long, value_enum, default_value = "human")]
    pub format: crate::Format,
}

fn parse_from(text: &str) -> Result<f64, String> {
    let t = text.trim();
    if let Ok(jd) = t.parse::<f64>() {
        return if jd > 1e6 {
            Ok(jd)
        } else {
            Err(format!(
                "'{t}' is not a Julian date; give e.g. 2461400.5 or 2027-01-01"
            ))
        };
    }
    time::parse_iso(t).map_err(|e| e.to_string())
}

fn now_jd() -> f64 {
    let secs = std::time::SystemTime::now()
        .duration_since(std::time::UNIX_EPOCH)
        .map_or(0.0, |d| d.as_secs_f64());
    time::jd_from_unix(secs)
}

pub fn run(args: &Args, flags: &syzygy::settings::Layer, read: files::ReadArgs) -> u8 {
    let from = match args.from.as_deref().map(parse_from) {
        Some(Ok(jd)) => jd,
        Some(Err(e)) => {
            eprintln!("syz: --from: {e}");
            return 2;
        }
        None => now_jd(),
    };
    let one = match files::one_body(&args.file, args.system.as_deref(), &args.body, flags, read) {
        Ok(one) => one,
        Err((_, e)) => {
            eprintln!("syz: {e}");
            return 2;
        }
    };
    let (a, si, bi) = (&one.analysis, one.system, one.body);
    let eph = match Ephemeris::of(a, si, bi) {
        Ok(e) => e,
        Err(e) => {
            eprintln!("syz: {e}");
            return 1;
        }
    };
    let transits = match eph.upcoming(from, args.count as usize) {
        Ok(t) => t,
        Err(e) => {
            eprintln!("syz: {e}");
            return 1;
        }
    };
    let mut assumptions = eph.assumptions.clone();
    assumptions.extend(eph.time_assumptions(&transits));
    let sym = eph.system.symbol();
    let from_text = time::iso(from, time::Scale::Utc).unwrap_or_else(|_| format!("JD {from}"));
    let sys_name = a.model.systems.get(si).map_or("", |s| s.name.as_str());
    match args.format {
        crate::Format::Json => {
            let doc = serde_json::json!({
                "version": syzygy::report::JSON_VERSION,
                "system": sys_name,
                "body": args.body,
                "from_utc": from_text,
                "epoch": {"jd": eph.t0_declared, "time_system": sym, "sigma_days": eph.sigma_t0_days},
                "period": {"days": eph.period_days, "sigma_days": eph.sigma_period_days},
                "transits": transits.iter().map(|t| serde_json::json!({
                    "n": t.n,
                    "utc": t.utc,
                    "jd": t.jd,
                    "time_system": sym,
                    "jd_utc": t.jd_utc,
                    "sigma_days": t.sigma_days,
                })).collect::<Vec<_>>(),
                "assumptions": assumptions,
            });
            println!("{}", serde_json::to_string_pretty(&doc).unwrap_or_default());
        }
        crate::Format::Human => {
            println!(
                "Upcoming transits of {} ({sys_name}), from {from_text}",
                args.body
            );
            println!(
                "  T0 = {} {sym}, P = {} d",
                syzygy::format::julian_date(eph.t0_declared, eph.sigma_t0_days, eph.sigma_t0_days),
                syzygy::format::with_uncertainty(
                    eph.period_days,
                    eph.sigma_period_days,
                    eph.sigma_period_days
                )
            );
            println!();
            let jd_head = format!("mid-transit ({sym})");
            println!(
                "  {:>7}  {:<22}  {:<18}  {:>14}",
                "n", "mid-transit (UTC)", jd_head, "± 1 sigma"
            );
            for t in &transits {
                let minutes = t.sigma_days * 24.0 * 60.0;
                println!(
                    "  {:>7}  {:<22}  {:<18.6}  {:>10.1} min",
                    t.n, t.utc, t.jd, minutes
                );
            }
            println!("\nassumed:");
            for s in &assumptions {
                println!("  - {s}");
            }
        }
    }
    0
}
