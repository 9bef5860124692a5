//! `syz explain FILE BODY.QUANTITY`: the derivation tree and error budget of one value.

use crate::eval_cmd::propagation_words;
use crate::files;
use syzygy::diagnostic::Severity;
use syzygy::settings::Layer;

pub fn run(
    file: &std::path::Path,
    target: &str,
    system: Option<&str>,
    flags: &Layer,
    read: files::ReadArgs,
) -> u8 {
    // `SYSTEM/BODY.QUANTITY`, as `--set` takes it, names the system too.
    let (named, rest) = match target.rsplit_once('/') {
        Some((sys, rest)) => (Some(sys), rest),
        None => (None, target),
    };
    let system = match (named, system) {
        (Some(a), Some(b)) if a != b => {
            eprintln!("syz: '{target}' names system \"{a}\", but --system names \"{b}\"");
            return 2;
        }
        (Some(a), _) => Some(a),
        (None, b) => b,
    };
    let Some((body, qty)) = rest.split_once('.') else {
        eprintln!("syz: expected BODY.QUANTITY (or SYSTEM/BODY.QUANTITY), such as b.density, found '{target}'");
        return 2;
    };
    let one = match files::one_body(file, system, body, flags, read) {
        Ok(one) => one,
        Err((_, e)) => {
            eprintln!("syz: {e}");
            return 2;
        }
    };
    let (a, options, si, bi) = (&one.analysis, &one.settings.options, one.system, one.body);
    let kind = a
        .model
        .systems
        .get(si)
        .and_then(|s| s.bodies.get(bi))
        .map(|b| b.kind);
    let Some(def) = kind.and_then(|k| syzygy::quantities::find(k, qty)) else {
        let meant = kind.and_then(|k| syzygy::quantities::suggest(k, qty));
        eprintln!(
            "syz: '{qty}' is not a quantity of '{body}'{}",
            meant.map_or_else(String::new, |m| format!("; did you mean '{m}'?"))
        );
        return 2;
    };
    match syzygy::report::explain_text(a, si, (bi, def.qty)) {
        Some(text) => {
            print!("{}", crate::render::printable(&text));
            println!("\nuncertainties: {}", propagation_words(options));
            let bad = a
                .diagnostics
                .iter()
                .filter(|d| d.severity == Severity::Error)
                .count();
            if bad > 0 {
                eprintln!("note: the file has {bad} error(s); run `syz check` on it");
            }
            0
        }
        None => {
            eprintln!(
                "syz: {body}.{} has no value: {}",
                def.name,
                syzygy::report::missing_text(a, si, bi, def.qty)
            );
            1
        }
    }
}
