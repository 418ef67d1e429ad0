//! The integration tests, one crate (one link) with a module per concern. Run one module with
//! `cargo test --test it NAME` (a name filter: `cargo test --test it architecture`). The shared
//! helpers are in `support/`; the data they read stay in `tests/broken/`, `tests/broken_cards/`
//! and `tests/fixtures/`, the insta snapshots in `tests/it/snapshots/`.

mod support;

mod architecture;
mod archive;
mod armature_test;
mod armature_test_cli;
mod broken_files;
mod brush_neutral;
mod cli;
mod cli_errors;
mod cli_safety;
mod coil_making;
mod coil_page;
mod csv_output;
mod diagram_tags;
mod domain_notes;
mod end_view;
mod engine_properties;
mod every_coil;
mod exact_symmetry;
mod explore;
mod external_checks;
mod fault_kinds;
mod fault_locator;
mod frog_leg;
mod frog_leg_loops;
mod front_pitch;
mod front_plot;
mod fuzz;
mod greyscale;
mod identify_cli;
mod identify_round_trip;
mod inch_units;
mod kill_sheet;
mod kill_test;
mod kind_in_one_place;
mod legibility;
mod multiplex_equalizers;
mod page_tree;
mod rating_external;
mod rating_limits;
mod rating_sheet;
mod rating_snapshots;
mod reactance;
mod refused_outputs;
mod render_only_formats;
mod report_snapshots;
mod rewind_cli;
mod rewind_properties;
mod rewind_verdict;
mod rule_cases;
mod sheet_bench;
mod sheet_cli;
mod sheet_pdf;
mod sheet_render;
mod sheet_set;
mod sheet_snapshots;
mod sheet_structure;
mod shop_pages;
mod span_limits;
mod terminal_escapes;
mod test_sheet;
mod winding_order;
