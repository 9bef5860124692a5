//! `syz ephemeris`: upcoming mid-transit times of one planet, with first and fourth contact
//! where the duration is known, and, from an observing site, altitudes and whether each
//! transit can be watched.

use crate::files;
use syzygy::ephemeris::{self, Ephemeris, Transit, Visibility};
use syzygy::sky::Site;
use syzygy::time;

#[derive(clap::Args)]
#[command(
    after_help = "Examples:\n  syz ephemeris examples/veyra.syz b\n  syz ephemeris examples/veyra.syz b --from 2027-01-01 --count 5\n  syz ephemeris examples/veyra.syz b --from 2461400.5   # a JD in UTC\n  syz ephemeris examples/orrin.syz b --site 28.76,-17.88,2300 --observable"
)]
pub struct Args {
    /// The *.syz file.
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
    /// Observing site LAT,LON[,ELEVATION_M]: geodetic latitude and longitude in degrees,
    /// north and EAST positive (west longitudes are negative), elevation in metres.
    /// Overrides `[site]` of syzygy.toml. Needs the host star's right_ascension and
    /// declination.
    #[arg(long, allow_hyphen_values = true)]
    pub site: Option<String>,
    /// Lowest altitude of the star, degrees, at which a transit counts as observable.
    #[arg(long, default_value_t = 30.0, allow_hyphen_values = true)]
    pub min_altitude: f64,
    /// List only transits seen whole from the site: the star at or above --min-altitude and
    /// the Sun below -18 deg (astronomical night) at ingress, mid-transit and egress.
    /// --count then counts transits looked at, not transits listed.
    #[arg(long)]
    pub observable: bool,
    /// Output format.
    #[arg(long, value_enum, default_value = "human")]
    pub format: crate::Format,
}

fn parse_from(text: &str) -> Result<f64, String> {
    let t = text.trim();
    let jd = match t.parse::<f64>() {
        Ok(jd) if jd > 1e6 => jd,
        Ok(_) => {
            return Err(format!(
                "'{t}' is not a Julian date; give e.g. 2461400.5 or 2027-01-01"
            ))
        }
        Err(_) => time::parse_iso(t).map_err(|e| e.to_string())?,
    };
    // The listing starts from this moment in TDB: a UTC it cannot convert is the option's
    // fault, not the file's.
    match time::convert(jd, time::Scale::Utc, time::Scale::Tdb) {
        Ok(_) => Ok(jd),
        Err(time::TimeError::UtcBefore1972) => Err(format!(
            "'{t}' is before 1972-01-01, when UTC did not count SI seconds; give a later date"
        )),
        Err(e) => Err(e.to_string()),
    }
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
    if !(args.min_altitude.is_finite() && (-90.0..=90.0).contains(&args.min_altitude)) {
        eprintln!(
            "syz: --min-altitude {}: expected -90 to 90 degrees",
            syzygy::format::sig(args.min_altitude, 6)
        );
        return 2;
    }
    let flag_site = match args.site.as_deref().map(Site::parse) {
        Some(Ok(s)) => Some(s),
        Some(Err(e)) => {
            eprintln!("syz: --site {e}");
            return 2;
        }
        None => None,
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
    let warnings = eph.warnings(&transits);
    let mut assumptions = eph.assumptions.clone();
    assumptions.extend(eph.time_assumptions(&transits));
    let site = flag_site.or(one.settings.site);
    if args.observable && site.is_none() {
        eprintln!("syz: --observable needs a site: give --site LAT,LON[,ELEVATION_M] or a [site] table in syzygy.toml");
        return 2;
    }
    let seen: Vec<Option<Visibility>> = match site {
        None => vec![None; transits.len()],
        Some(site) => {
            let pos = match ephemeris::sky_position(a, si, bi) {
                Ok(p) => p,
                Err(e) => {
                    eprintln!("syz: {e}");
                    return 1;
                }
            };
            let mut v = Vec::with_capacity(transits.len());
            for t in &transits {
                match pos.visibility(&site, args.min_altitude, t) {
                    Ok(x) => v.push(Some(x)),
                    Err(e) => {
                        eprintln!("syz: {e}");
                        return 1;
                    }
                }
            }
            assumptions.extend(ephemeris::site_assumptions(
                eph.system,
                eph.duration_days.is_some(),
            ));
            v
        }
    };
    let total = transits.len();
    let rows: Vec<(&Transit, Option<&Visibility>)> = transits
        .iter()
        .zip(seen.iter().map(Option::as_ref))
        .filter(|(_, v)| !args.observable || v.is_some_and(|v| v.observable))
        .collect();
    if args.observable {
        assumptions.push(format!(
            "--observable: {} of the {total} transits looked at are listed",
            rows.len()
        ));
    }
    let deg = 180.0 / std::f64::consts::PI;
    let site_json = site.map(|s| {
        serde_json::json!({
            "latitude_deg": s.latitude * deg,
            "longitude_deg": s.longitude * deg,
            "elevation_m": s.elevation_m,
            "min_altitude_deg": args.min_altitude,
        })
    });
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
                "site": site_json,
                "transits": rows.iter().map(|(t, v)| serde_json::json!({
                    "n": t.n,
                    "utc": t.utc,
                    "jd": t.jd,
                    "time_system": sym,
                    "jd_utc": t.jd_utc,
                    "sigma_days": t.sigma_days,
                    "contacts": t.contacts.as_ref().map(|c| serde_json::json!({
                        "ingress_utc": c.ingress_utc,
                        "egress_utc": c.egress_utc,
                        "ingress_jd": c.ingress_jd,
                        "egress_jd": c.egress_jd,
                        "sigma_days": c.sigma_days,
                    })),
                    "visibility": v.map(|v| serde_json::json!({
                        "observable": v.observable,
                        "moments": v.moments.iter().map(|m| serde_json::json!({
                            "at": m.label,
                            "star_altitude_deg": m.star_altitude_deg,
                            "airmass": m.airmass,
                            "sun_altitude_deg": m.sun_altitude_deg,
                        })).collect::<Vec<_>>(),
                    })),
                })).collect::<Vec<_>>(),
                "warnings": warnings,
                "assumptions": assumptions,
            });
            println!("{}", serde_json::to_string_pretty(&doc).unwrap_or_default());
        }
        crate::Format::Human => {
            println!(
                "Upcoming transits of {} ({sys_name}), from {from_text}",
                args.body
            );
            if let Some(s) = &site {
                // East positive; a longitude past 180 is said as the west one it is too.
                let lon = s.longitude * deg;
                let west = if lon > 180.0 {
                    format!(", i.e. {:.4}° west", 360.0 - lon)
                } else {
                    String::new()
                };
                println!(
                    "  seen from latitude {:.4}°, longitude {lon:.4}° (east positive{west}), {:.0} m; star at least {}° up",
                    s.latitude * deg,
                    s.elevation_m,
                    args.min_altitude
                );
            }
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
            for (t, v) in &rows {
                println!(
                    "  {:>7}  {:<22}  {:<18.6}  {:>14}",
                    t.n,
                    t.utc,
                    t.jd,
                    ephemeris::sigma_text(t.sigma_days)
                );
                if let Some(c) = &t.contacts {
                    println!(
                        "  {:>7}  ingress {}  egress {}  (± {} each)",
                        "",
                        c.ingress_utc,
                        c.egress_utc,
                        ephemeris::sigma_text(c.sigma_days)
                    );
                }
                if let Some(v) = v {
                    let parts: Vec<String> = v
                        .moments
                        .iter()
                        .map(|m| {
                            format!(
                                "{} alt {:.1}° X {} Sun {:.1}°",
                                m.label,
                                m.star_altitude_deg,
                                m.airmass.map_or("-".to_string(), |x| format!("{x:.2}")),
                                m.sun_altitude_deg
                            )
                        })
                        .collect();
                    println!(
                        "  {:>7}  {}: {}",
                        "",
                        if v.observable {
                            "observable"
                        } else {
                            "not observable"
                        },
                        parts.join("; ")
                    );
                }
            }
            if rows.is_empty() {
                println!("  (none of the {total} transits looked at is observable)");
            }
            for w in &warnings {
                println!("\nwarning: {w}");
            }
            println!("\nassumed:");
            for s in &assumptions {
                println!("  - {s}");
            }
        }
    }
    let bad = a
        .diagnostics
        .iter()
        .filter(|d| d.severity == syzygy::diagnostic::Severity::Error)
        .count();
    if bad > 0 {
        eprintln!("note: the file has {bad} error(s); run `syz check` on it");
    }
    0
}
