//! Which gears to buy for a chart (`gearsieve chart --buy N`) in every format: the best
//! choices with the threads each gains, the threads cut from the gears on hand, those out of
//! reach. A sink: it computes nothing about gears.
//!
//! JSON: `{"schema_version", "series", "machine", "banjo", "tolerance", "complete", "caution",
//! "buy": {"most", "teeth": [lo, hi], "module_mm", "pressure_angle_deg"}, "on_hand": [thread…],
//! "choice_count", "choices": [{"rank", "to_buy": [teeth…], "gains", "threads": [thread…]}],
//! "out_of_reach": [thread…]}`. CSV: one row per choice listed, `rank,to_buy,gains,threads`
//! (gears and threads separated by spaces and `; `).

use std::io::{self, Write};

use serde::Serialize;

use super::document::header;
use super::json::{banjo, machine, BanjoJson, MachineJson};
use crate::model::pool::fmt_num;
use crate::report::words::THREAD_CAUTION;
use crate::report::{write_json, Completion, Document, RenderError, Report, Table, SCHEMA_VERSION};
use crate::trades::thread::chart_buy::{BuyChart, BuyChoice};
use crate::trades::thread::Lathe;

/// What buying gears does for a chart, ready to print.
pub struct BuyChartReport<'a> {
    /// The lathe and how it was searched.
    pub lathe: &'a Lathe,
    /// The series' name or file.
    pub series: &'a str,
    /// What was found.
    pub chart: &'a BuyChart,
}

impl BuyChartReport<'_> {
    fn labels(&self, rows: impl Iterator<Item = usize>) -> Vec<String> {
        rows.map(|k| self.chart.rows[k].label.clone()).collect()
    }

    fn on_hand(&self) -> Vec<String> {
        self.chart.rows.iter().filter(|r| r.on_hand).map(|r| r.label.clone()).collect()
    }

    fn out_of_reach(&self) -> Vec<String> {
        self.chart.out_of_reach().map(|r| r.label.clone()).collect()
    }
}

fn teeth(c: &BuyChoice) -> String {
    let t: Vec<String> = c.basket.teeth().iter().map(u32::to_string).collect();
    t.join(" ")
}

impl Report for BuyChartReport<'_> {
    fn kind(&self) -> &'static str {
        "gears to buy for a thread chart"
    }

    fn completion(&self) -> Completion {
        Completion { complete: self.chart.complete, found: !self.chart.choices.is_empty() }
    }

    fn document(&self) -> Option<Document> {
        let c = self.chart;
        let p = &c.purchase;
        let mut d = Document::new();
        d.title(format!("Gears to buy for the chart of {} ({} threads)", self.series, c.rows.len()));
        header(&mut d, self.lathe, false);
        d.line(format!(
            "To buy: up to {} gear{} of {} teeth, module {} mm, {}°",
            p.most,
            if p.most == 1 { "" } else { "s" },
            p.teeth,
            fmt_num(p.group.module_mm),
            fmt_num(p.group.pressure_angle_deg)
        ));
        d.blank();
        let status = if c.complete { "" } else { "INCOMPLETE (interrupted): " };
        let on_hand = self.on_hand();
        d.line(format!(
            "{status}{} of {} threads are cut within the tolerance from the gears on hand{}",
            on_hand.len(),
            c.rows.len(),
            if on_hand.is_empty() { ".".to_string() } else { format!(": {}.", on_hand.join(", ")) }
        ));
        d.blank();
        if c.choices.is_empty() {
            d.line("No choice of gears on offer makes another thread cuttable.");
        } else {
            let (n, listed) = (c.choice_count, c.choices.len());
            d.line(format!(
                "{n} choice{} gain{} threads (each gear in a choice adds one); {} by threads gained, then \
                 fewest gears, then smallest teeth:",
                if n == 1 { "" } else { "s" },
                if n == 1 { "s" } else { "" },
                if listed == n { "listed".to_string() } else { format!("the best {listed} listed") }
            ));
            d.blank();
            let rows: Vec<Vec<String>> = c
                .choices
                .iter()
                .enumerate()
                .map(|(k, ch)| {
                    vec![
                        (k + 1).to_string(),
                        teeth(ch),
                        ch.gains.len().to_string(),
                        self.labels(ch.gains.iter().copied()).join(", "),
                    ]
                })
                .collect();
            d.table(Table::new(&["#", "buy (teeth)", "gains", "threads gained"], &[0, 2]).with_rows(rows));
        }
        let out = self.out_of_reach();
        if !out.is_empty() {
            d.blank();
            d.line(format!("Out of reach with up to {} gears bought: {}.", p.most, out.join(", ")));
        }
        d.blank();
        d.line("gains: threads cut within the tolerance with the gears bought that the gears on hand do not cut.");
        d.line("A gear bought may serve as the idler of a simple train; `gearsieve thread --pitch P` with the gears bought added lists the setups.");
        for (i, sentence) in THREAD_CAUTION.split_inclusive(". ").enumerate() {
            let lead = if i == 0 { "CAUTION:" } else { "        " };
            d.note(format!("{lead} {}", sentence.trim_end()));
        }
        Some(d)
    }

    fn csv(&self, w: &mut dyn Write) -> Result<(), RenderError> {
        Ok(write_csv(self, w)?)
    }

    fn json(&self, w: &mut dyn Write) -> Result<(), RenderError> {
        let c = self.chart;
        let p = &c.purchase;
        let doc = BuyDoc {
            schema_version: SCHEMA_VERSION,
            series: self.series.to_string(),
            machine: machine(self.lathe),
            banjo: banjo(self.lathe),
            tolerance: self.lathe.tolerance.to_f64(),
            complete: c.complete,
            caution: THREAD_CAUTION,
            buy: OfferJson {
                most: p.most,
                teeth: [p.teeth.lo, p.teeth.hi],
                module_mm: p.group.module_mm,
                pressure_angle_deg: p.group.pressure_angle_deg,
            },
            on_hand: self.on_hand(),
            choice_count: c.choice_count,
            choices: c
                .choices
                .iter()
                .enumerate()
                .map(|(k, ch)| ChoiceJson {
                    rank: k + 1,
                    to_buy: ch.basket.teeth().to_vec(),
                    gains: ch.gains.len(),
                    threads: self.labels(ch.gains.iter().copied()),
                })
                .collect(),
            out_of_reach: self.out_of_reach(),
        };
        write_json(&doc, w)
    }
}

fn write_csv(r: &BuyChartReport, w: &mut dyn Write) -> io::Result<()> {
    let mut out = ::csv::Writer::from_writer(w);
    out.write_record(["rank", "to_buy", "gains", "threads"])?;
    for (k, ch) in r.chart.choices.iter().enumerate() {
        out.write_record([
            (k + 1).to_string(),
            teeth(ch),
            ch.gains.len().to_string(),
            r.labels(ch.gains.iter().copied()).join("; "),
        ])?;
    }
    out.flush()
}

#[derive(Serialize)]
struct OfferJson {
    most: u32,
    teeth: [u32; 2],
    module_mm: f64,
    pressure_angle_deg: f64,
}

#[derive(Serialize)]
struct ChoiceJson {
    rank: usize,
    to_buy: Vec<u32>,
    gains: usize,
    threads: Vec<String>,
}

#[derive(Serialize)]
struct BuyDoc {
    schema_version: u32,
    series: String,
    machine: MachineJson,
    banjo: Option<BanjoJson>,
    tolerance: f64,
    complete: bool,
    caution: &'static str,
    buy: OfferJson,
    on_hand: Vec<String>,
    choice_count: usize,
    choices: Vec<ChoiceJson>,
    out_of_reach: Vec<String>,
}
