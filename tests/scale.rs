//! Searches at scale through the real binary: split runs and their merge, streaming every train,
//! the Pareto shortlist, and Ctrl-C.

mod common;
use common::*;
use std::process::{Command, Stdio};

fn write(dir: &tempfile::TempDir, name: &str, text: &str) -> String {
    let p = dir.path().join(name);
    std::fs::write(&p, text).unwrap();
    p.to_string_lossy().into_owned()
}

#[test]
fn merging_the_parts_prints_what_one_run_prints() {
    let args = ["search", "--ratio", "29.530588", "--tol", "20ppm", "--teeth", "12..100", "--format", "json"];
    let whole = gearsieve(&args);
    assert_eq!(whole.code, 0);
    let dir = tempfile::tempdir().unwrap();
    let mut files = Vec::new();
    for i in 1..=4 {
        let part = gearsieve(&[&args[..], &["--shard", &format!("{i}/4")]].concat());
        assert_eq!(part.code, 0, "{}", part.stderr);
        files.push(write(&dir, &format!("part{i}.json"), &part.stdout));
    }
    files.reverse();
    let mut merge_args = vec!["merge"];
    merge_args.extend(files.iter().map(String::as_str));
    let merged = gearsieve(&merge_args);
    assert_eq!(merged.code, 0, "{}", merged.stderr);
    assert_eq!(merged.stdout, whole.stdout);
}

/// The parts of a search counted as a lower bound merge into the same listing as one run, still
/// marked a lower bound, and counted at least as far as the one run.
#[test]
fn parts_of_a_lower_bound_count_merge_into_the_same_listing() {
    let args = [
        "search",
        "--ratio",
        "29.530588",
        "--tol",
        "10ppm",
        "--teeth",
        "12..40",
        "--stages",
        "5",
        "--count",
        "lower-bound",
        "--format",
        "json",
    ];
    let whole = gearsieve(&args);
    assert_eq!(whole.code, 0, "{}", whole.stderr);
    let dir = tempfile::tempdir().unwrap();
    let mut files = Vec::new();
    for i in 1..=3 {
        let part = gearsieve(&[&args[..], &["--shard", &format!("{i}/3")]].concat());
        assert_eq!(part.code, 0, "{}", part.stderr);
        files.push(write(&dir, &format!("part{i}.json"), &part.stdout));
    }
    let mut merge_args = vec!["merge", "--format", "json"];
    merge_args.extend(files.iter().map(String::as_str));
    let merged = gearsieve(&merge_args);
    assert_eq!(merged.code, 0, "{}", merged.stderr);
    let (one, parts): (serde_json::Value, serde_json::Value) =
        (serde_json::from_str(&whole.stdout).unwrap(), serde_json::from_str(&merged.stdout).unwrap());
    assert_eq!(one["trains"], parts["trains"]);
    assert_eq!(parts["count_kind"], "lower_bound");
    assert_eq!(one["count_kind"], "lower_bound");
    let within = |v: &serde_json::Value| v["counted_within"].as_f64().unwrap();
    // Each part holds at most the best K of the whole, so its K-th is no closer than the whole's.
    assert!(within(&parts) >= within(&one), "{} vs {}", within(&parts), within(&one));
    assert!(parts["count"].as_u64().unwrap() >= one["count"].as_u64().unwrap());
}

#[test]
fn merge_refuses_incomplete_or_mismatched_parts() {
    let dir = tempfile::tempdir().unwrap();
    let part = |i: u32, n: u32, ratio: &str| {
        let r = gearsieve(&[
            "search",
            "--ratio",
            ratio,
            "--teeth",
            "12..40",
            "--format",
            "json",
            "--shard",
            &format!("{i}/{n}"),
        ]);
        write(&dir, &format!("{ratio}-{i}-{n}.json").replace('/', "_"), &r.stdout)
    };
    let (a, b, c) = (part(1, 2, "3"), part(2, 2, "3"), part(2, 2, "4"));
    let d = part(1, 3, "3");
    let whole = {
        let r = gearsieve(&["search", "--ratio", "3", "--teeth", "12..40", "--format", "json"]);
        write(&dir, "whole.json", &r.stdout)
    };
    let junk = write(&dir, "junk.json", "{\"not\": \"ours\"}");
    for (files, want) in [
        (vec![a.as_str()], "part 2/2 is missing"),
        (vec![a.as_str(), a.as_str()], "given twice"),
        (vec![a.as_str(), c.as_str()], "different question"),
        (vec![a.as_str(), d.as_str()], "split 3 ways"),
        (vec![whole.as_str()], "not part of a split search"),
        (vec![junk.as_str()], "not the JSON of a gearsieve search"),
        (vec!["no-such.json"], "cannot read it"),
    ] {
        let mut args = vec!["merge"];
        args.extend(files);
        let r = gearsieve(&args);
        assert_eq!(r.code, 2, "{args:?}: {}", r.stderr);
        assert!(r.stderr.contains(want), "{args:?}: {}", r.stderr);
    }
    let ok = gearsieve(&["merge", &a, &b]);
    assert_eq!(ok.code, 0);
}

#[test]
fn limit_zero_streams_every_train() {
    let base = ["search", "--ratio", "37.5", "--tol", "10ppm", "--teeth", "12..60", "--stages", "3"];
    let (_, counted) = json(&base);
    let n = counted["count"].as_u64().unwrap();
    assert!(n > 100);
    let csv = gearsieve(&[&base[..], &["--limit", "0", "--format", "csv"]].concat());
    assert_eq!(csv.code, 0);
    assert_eq!(csv.stdout.lines().count() as u64, n + 1, "header plus one row per train");
    let lines = gearsieve(&[&base[..], &["--limit", "0", "--format", "json"]].concat());
    let all: Vec<serde_json::Value> =
        lines.stdout.lines().map(|l| serde_json::from_str(l).unwrap()).collect();
    assert_eq!(all.len() as u64, n + 1);
    assert_eq!(all.last().unwrap()["count"], n);
    // The best train of the listing is among the streamed ones, and the stream is deterministic.
    assert!(all.iter().any(|t| t["stages"] == counted["trains"][0]["stages"]));
    let again = gearsieve(&[&base[..], &["--limit", "0", "--format", "json", "--threads", "1"]].concat());
    assert_eq!(again.stdout, lines.stdout);
    let table = gearsieve(&[&base[..], &["--limit", "0"]].concat());
    assert_eq!(table.code, 2);
    assert!(table.stderr.contains("--limit"));
}

#[test]
fn pareto_lists_only_undominated_trains() {
    let r = gearsieve(&[
        "search", "--ratio", "37.5", "--tol", "1%", "--teeth", "12..80", "--pareto", "--limit", "0",
    ]);
    assert_eq!(r.code, 2, "--limit 0 does not go with --pareto");
    let (code, v) = json(&[
        "search", "--ratio", "7.3", "--tol", "1%", "--teeth", "12..80", "--pareto", "--limit", "1000",
    ]);
    assert_eq!(code, 0);
    let front = v["trains"].as_array().unwrap();
    assert_eq!(v["pareto_size"].as_u64().unwrap() as usize, front.len());
    assert!(front.len() > 1);
    let key = |t: &serde_json::Value| {
        (t["error"].as_f64().unwrap().abs(), t["meshes"].as_u64().unwrap(), t["size"].as_u64().unwrap())
    };
    for a in front {
        for b in front {
            let (ka, kb) = (key(a), key(b));
            let beats = ka.0 <= kb.0 && ka.1 <= kb.1 && ka.2 <= kb.2 && ka != kb;
            assert!(!beats, "{a} beats {b}");
        }
    }
}

#[test]
fn ctrl_c_prints_the_best_so_far_marked_incomplete() {
    let (code, v, stderr) = interrupted_after(
        1500,
        &["--ratio", "29.530588", "--tol", "1ppm", "--teeth", "12..150", "--stages", "4", "--limit", "5"],
    );
    assert_eq!(code, Some(130), "{stderr}");
    assert_eq!(v["complete"], false);
    assert!(stderr.contains("interrupted"));
}

/// An interrupted run never leaves a file that passes for a whole result: with `--output x.csv`
/// the rows found so far go to `x.incomplete.csv`, and stderr says so; `x.csv` is not written.
#[test]
fn an_interrupted_run_keeps_its_file_under_a_name_that_says_so() {
    let dir = tempfile::tempdir().unwrap();
    for (format, name, stream) in [("csv", "x.csv", "0"), ("json", "y.json", "5")] {
        let path = dir.path().join(name);
        let child = Command::new(env!("CARGO_BIN_EXE_gearsieve"))
            .args(["search", "--ratio", "29.530588", "--tol", "1ppm", "--teeth", "12..150", "--stages", "4"])
            .args(["--limit", stream, "--format", format, "--threads", "2", "--output"])
            .arg(&path)
            .stderr(Stdio::piped())
            .spawn()
            .unwrap();
        std::thread::sleep(std::time::Duration::from_millis(1500));
        assert!(Command::new("kill").args(["-INT", &child.id().to_string()]).status().unwrap().success());
        let out = child.wait_with_output().unwrap();
        let stderr = String::from_utf8_lossy(&out.stderr);
        assert_eq!(out.status.code(), Some(130), "{stderr}");
        assert!(!path.exists(), "{name} must not pass for a whole result");
        let kept = path.with_file_name(name.replace('.', ".incomplete."));
        assert!(kept.exists(), "{stderr}");
        assert!(stderr.contains("cut short") && stderr.contains(&kept.display().to_string()), "{stderr}");
        let text = std::fs::read_to_string(&kept).unwrap();
        if format == "csv" {
            assert!(text.starts_with("order,ratio"), "{text}");
        } else {
            let v: serde_json::Value = serde_json::from_str(&text).unwrap();
            assert_eq!(v["complete"], false);
        }
    }
}

/// Run a JSON search on two threads, send it Ctrl-C after `ms`, and return its exit code, its
/// JSON and its stderr.
fn interrupted_after(ms: u64, args: &[&str]) -> (Option<i32>, serde_json::Value, String) {
    let child = Command::new(env!("CARGO_BIN_EXE_gearsieve"))
        .arg("search")
        .args(args)
        .args(["--format", "json", "--threads", "2"])
        .stdout(Stdio::piped())
        .stderr(Stdio::piped())
        .spawn()
        .unwrap();
    std::thread::sleep(std::time::Duration::from_millis(ms));
    let status = Command::new("kill").args(["-INT", &child.id().to_string()]).status().unwrap();
    assert!(status.success());
    let out = child.wait_with_output().unwrap();
    let stderr = String::from_utf8_lossy(&out.stderr).into_owned();
    let v = serde_json::from_slice(&out.stdout).unwrap_or_else(|e| panic!("not JSON ({e}): {stderr}"));
    (out.status.code(), v, stderr)
}

/// Ctrl-C inside the factor engine's long count: the stage counts already done are listed, the
/// one cut short adds nothing it has not finished.
#[test]
fn ctrl_c_stops_an_exact_count_and_keeps_what_was_done() {
    let (code, v, stderr) = interrupted_after(
        3000,
        &["--ratio", "127/120", "--teeth", "12..250", "--stages", "3..5", "--long", "--limit", "5"],
    );
    assert_eq!(code, Some(130), "{stderr}");
    assert_eq!(v["complete"], false);
    let trains = v["trains"].as_array().unwrap();
    assert_eq!(trains.len(), 5, "three- and four-stage trains were done");
    assert!(trains.iter().all(|t| t["ratio"] == "127/120" && t["meshes"].as_u64() < Some(5)));
    let count = v["count"].as_u64().unwrap();
    assert!((5..2_000_000_000_000).contains(&count), "a lower bound, without the cut-short five: {count}");
}

#[test]
fn a_search_that_would_run_for_hours_needs_long() {
    let r = gearsieve(&[
        "search",
        "--ratio",
        "29.530588",
        "--tol",
        "1ppm",
        "--teeth",
        "12..150",
        "--stages",
        "6",
    ]);
    assert_eq!(r.code, 2, "{}", r.stderr);
    assert!(r.stderr.contains("--long") && r.stderr.contains("hours"), "{}", r.stderr);
    assert!(r.stdout.is_empty());
}

/// Counting four billion exact trains is quick, but streaming them visits each one: the
/// forecast judges the stream by the engine that streams.
#[test]
fn streaming_billions_of_exact_trains_needs_long() {
    let args = ["search", "--ratio", "127/120", "--teeth", "12..200", "--stages", "4", "--format", "csv"];
    let counted = gearsieve(&[&args[..], &["--limit", "1"]].concat());
    assert_eq!(counted.code, 0, "{}", counted.stderr);
    let streamed = gearsieve(&[&args[..], &["--limit", "0"]].concat());
    assert_eq!(streamed.code, 2, "{}", streamed.stderr);
    assert!(streamed.stderr.contains("--long") && streamed.stderr.contains("hours"), "{}", streamed.stderr);
}

#[test]
fn a_closed_pipe_ends_quietly() {
    use std::io::{BufRead, BufReader};
    let mut child = Command::new(env!("CARGO_BIN_EXE_gearsieve"))
        .args(["search", "--ratio", "37.5", "--tol", "1%", "--teeth", "12..150", "--stages", "3"])
        .args(["--limit", "0", "--format", "csv", "--quiet"])
        .stdout(Stdio::piped())
        .stderr(Stdio::piped())
        .spawn()
        .unwrap();
    let mut first = String::new();
    BufReader::new(child.stdout.take().unwrap()).read_line(&mut first).unwrap();
    assert!(first.starts_with("order,ratio"), "{first}");
    // The reader is dropped here: the pipe is closed while millions of rows are still to come.
    let out = child.wait_with_output().unwrap();
    assert_eq!(out.status.code(), Some(0));
    assert!(out.stderr.is_empty(), "{}", String::from_utf8_lossy(&out.stderr));
}

/// Four stages of 12..150 teeth hitting 127/120 exactly: the count the factor engine gives was
/// found the same by the meet engine (which spells out value sequences) and by a convolution
/// of value-pair products (tests/engines.rs); the smallest trains need the 127-tooth gear once.
/// They are the three arrangements of one gear set (drivers 24, 24, 20, 18; driven 12, 12, 12,
/// 127: the 127 meets the 24, the 20 or the 18, worked by hand).
#[test]
fn exact_four_stage_trains_are_counted_and_the_smallest_listed() {
    let (code, v) = json(&[
        "search",
        "--ratio",
        "127/120",
        "--teeth",
        "12..150",
        "--stages",
        "4",
        "--limit",
        "1",
        "--arrangements",
    ]);
    assert_eq!(code, 0);
    assert_eq!(v["count"], 925_685_350u64);
    let set = &v["trains"][0];
    assert_eq!(set["arrangements"], 3);
    let others = set["other_arrangements"].as_array().unwrap();
    assert_eq!(others.len(), 2);
    for t in std::iter::once(set).chain(others) {
        assert_eq!(t["ratio"], "127/120");
        assert_eq!(t["size"], 249);
        let driven: Vec<u64> =
            t["stages"].as_array().unwrap().iter().map(|s| s["driven"].as_u64().unwrap()).collect();
        assert_eq!(driven.iter().filter(|&&z| z == 127).count(), 1, "{driven:?}");
    }
    // Split runs of an exact search merge into the same result.
    let args = ["search", "--ratio", "366/365", "--teeth", "12..120", "--stages", "1..4", "--format", "json"];
    let whole = gearsieve(&args);
    assert_eq!(whole.code, 0, "{}", whole.stderr);
    let dir = tempfile::tempdir().unwrap();
    let files: Vec<String> = (1..=3)
        .map(|i| {
            let part = gearsieve(&[&args[..], &["--shard", &format!("{i}/3")]].concat());
            assert_eq!(part.code, 0, "{}", part.stderr);
            write(&dir, &format!("part{i}.json"), &part.stdout)
        })
        .collect();
    let mut merge_args = vec!["merge"];
    merge_args.extend(files.iter().map(String::as_str));
    let merged = gearsieve(&merge_args);
    assert_eq!(merged.code, 0, "{}", merged.stderr);
    assert_eq!(merged.stdout, whole.stdout);
}

/// GNU parallel runs the parts as separate processes, as a batch scheduler would; `.ci/run`
/// installs it (Debian package `parallel`) and sets `GEARSIEVE_REQUIRE_PARALLEL`, so there the
/// test cannot be skipped.
#[test]
fn parts_run_under_gnu_parallel_merge_into_the_single_run() {
    let available =
        Command::new("parallel").arg("--version").stdout(Stdio::null()).status().is_ok_and(|s| s.success());
    if !available {
        assert!(
            std::env::var_os("GEARSIEVE_REQUIRE_PARALLEL").is_none(),
            "GNU parallel is required here but not installed"
        );
        eprintln!("skipped: GNU parallel is not installed (.ci/run installs it)");
        return;
    }
    let args = ["search", "--ratio", "29.530588", "--tol", "20ppm", "--teeth", "12..100", "--format", "json"];
    let whole = gearsieve(&args);
    assert_eq!(whole.code, 0);
    let dir = tempfile::tempdir().unwrap();
    let part = dir.path().join("part-{}.json");
    let status = Command::new("parallel")
        .args(["--will-cite", "--halt", "now,fail=1", "--jobs", "2", env!("CARGO_BIN_EXE_gearsieve")])
        .args(args)
        .args(["--quiet", "--shard", "{}/5", "--output"])
        .arg(&part)
        .args([":::", "1", "2", "3", "4", "5"])
        .current_dir(env!("CARGO_MANIFEST_DIR"))
        .status()
        .unwrap();
    assert!(status.success(), "a part failed under GNU parallel: {status}");
    let files: Vec<String> =
        (1..=5).map(|i| dir.path().join(format!("part-{i}.json")).to_string_lossy().into_owned()).collect();
    let mut merge = vec!["merge"];
    merge.extend(files.iter().map(String::as_str));
    let merged = gearsieve(&merge);
    assert_eq!(merged.code, 0, "{}", merged.stderr);
    assert_eq!(merged.stdout, whole.stdout);
}

#[test]
fn a_part_that_holds_no_train_is_not_a_failure() {
    // An exact count is one unit of the factor engine: part 1 holds every train, part 2 none,
    // and part 2 still exits 0 so that a scheduler does not retry it.
    let args = ["search", "--ratio", "127/120", "--teeth", "20..127", "--stages", "4", "--format", "json"];
    let two = gearsieve(&[&args[..], &["--shard", "2/2"]].concat());
    assert_eq!(two.code, 0, "{}", two.stderr);
    assert!(two.stderr.contains("part 2/2 holds no train"), "{}", two.stderr);
    let one = gearsieve(&[&args[..], &["--shard", "1/2"]].concat());
    let whole = gearsieve(&args);
    let merged = {
        let dir = tempfile::tempdir().unwrap();
        let a = write(&dir, "1.json", &one.stdout);
        let b = write(&dir, "2.json", &two.stdout);
        gearsieve(&["merge", &a, &b])
    };
    assert_eq!(merged.stdout, whole.stdout);
}

/// A part says before it starts what it will take and what the whole search would take on one
/// machine, so a scheduler's parts can be sized.
#[test]
fn a_part_forecasts_its_own_time_and_the_whole_search() {
    let run = gearsieve(&[
        "search", "--ratio", "37.5", "--tol", "10ppm", "--teeth", "12..90", "--stages", "3", "--engine",
        "sieve", "--shard", "1/2", "--format", "json",
    ]);
    assert_eq!(run.code, 0, "{}", run.stderr);
    let line = run.stderr.lines().find(|l| l.starts_with("gearsieve: part 1/2: ")).unwrap_or_else(|| {
        panic!("no forecast line for the part in:\n{}", run.stderr);
    });
    assert!(line.contains(" on ") && line.contains("; the whole search "), "{line}");
    // Quiet parts say nothing.
    let quiet = gearsieve(&[
        "search", "--ratio", "37.5", "--tol", "10ppm", "--teeth", "12..90", "--stages", "3", "--engine",
        "sieve", "--shard", "1/2", "--format", "json", "--quiet",
    ]);
    assert!(!quiet.stderr.contains("gearsieve: part"), "{}", quiet.stderr);
}
