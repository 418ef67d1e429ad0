fn main() {
    let args: Vec<String> = std::env::args().collect();
    let text = std::fs::read_to_string(&args[1]).unwrap();
    let d = armsheet::design::parse_design(&text, &args[1]).unwrap_or_else(|e| { eprint!("{e}"); std::process::exit(2) });
    let w = armsheet::winding::trace_winding(&d).unwrap();
    println!("C={} N={} dummies={:?} yc={} yb={} yf={}", w.active_coils, w.coils, w.dummy_coils, w.pitches.commutator, w.pitches.back, w.pitches.front);
    println!("paths traced={} formula={} reentrancy={} formula={}", w.paths.len(), w.paths_formula, w.reentrancy(), w.reentrancy_formula);
    for b in &w.brushes { println!("brush {} {:?} angle {:.2} centre {:.3} under {:?} contacts {:?}", b.index, b.polarity, b.angle_deg, b.centre_segment, b.under, b.contacts); }
    for p in &w.paths { println!("path {} {}->{} n={} emf={} cur={}", p.index, p.from_brush, p.to_brush, p.coils.len(), p.emf_units, p.current); }
    println!("shorted {:?}", w.shorted_coils);
    println!("balance {:?}", w.balance);
    println!("eq {:?}", match &w.equalizers { armsheet::winding::EqualizerPlan::Possible(e) => format!("pitch {} possible {} groups {}", e.pitch, e.possible, e.groups.len()), o => format!("{o:?}") });
}
