"""Write the notebooks in notebooks/ from the cell lists below and execute them.

The notebooks are the product's face and stay thin: each loads a scenario,
shows a panel from resonance.ui and prints the verdict as text (which nbval
compares). The caution appears once per notebook: the panel opens with it (the
record panel's record closes with it). Cells whose output is a live widget view carry the tag
``nbval-ignore-output`` (widget model ids change at every run).

Run after changing a notebook's cells or anything that changes what they print:
``python tools/build_notebooks.py [04 07 ...]`` (executes with stored widget state off, so
each notebook stays a few KB; see ../shared/STACK.md).
"""

from __future__ import annotations

import subprocess
import sys
from pathlib import Path

import nbformat
from nbformat.v4 import new_code_cell, new_markdown_cell, new_notebook

HERE = Path(__file__).resolve().parent.parent / "notebooks"

WIDGET = {"tags": ["nbval-ignore-output"]}  # live widget view: model ids are volatile


def code(source: str, widget: bool = False) -> nbformat.NotebookNode:
    return new_code_cell(source, metadata=dict(WIDGET) if widget else {})


NOTEBOOKS: dict[str, list[nbformat.NotebookNode]] = {
    "01_single_mode_check.ipynb": [
        new_markdown_cell(
            "# Single-mode check: a machine on its support\n\n"
            "One degree of freedom: the pump and motor mass on the lateral stiffness of its skid. "
            "Drag the **speed range** and the **damping** and watch the unbalance response, the phase lag, "
            "the amplification factor (half-power method) and the separation margins against every "
            "excitation order. Shaded blue: the operating speeds; shaded orange: the speeds the range must "
            "keep clear of around each 1x coincidence (the scenario's flat margin for a structural mode).\n\n"
        ),
        code("import resonance as R"),
        code(
            'scenario = R.load("scenarios/cooling_water_pump.toml")\npanel = R.panel(scenario)\npanel',
            widget=True,
        ),
        new_markdown_cell(
            "The verdict and findings for the scenario as loaded (the panel above follows its controls):"
        ),
        code("print(panel.summary())\nprint()\nprint(panel.result.findings.to_text())"),
        new_markdown_cell(
            "Try: raise the minimum speed to about 1450 rpm (the 2x order line then clears the mode by the "
            "flat 15 % margin), or switch the units to US customary."
        ),
    ],
    "02_machine_on_support.ipynb": [
        new_markdown_cell(
            "# Machine on baseplate on foundation: several modes\n\n"
            "A lumped model of the machine, its baseplate and a concrete block on soil. The panel shows the "
            "modes, the unbalance response and receptance at a chosen mass, the interference diagram "
            "(natural frequencies against the excitation lines over speed, coincidences green when they "
            "pass and red when they fail), the findings worst first, and the predicted 1x casing velocity "
            "against the ISO 10816-3 zones.\n\n"
        ),
        code("import resonance as R"),
        code(
            'scenario = R.load("scenarios/feed_pump_foundation.toml")\npanel = R.panel(scenario)\npanel',
            widget=True,
        ),
        new_markdown_cell("Modes, verdict and findings for the scenario as loaded:"),
        code(
            "for mode in panel.result.modes:\n"
            '    print(f"{mode.label}: {mode.frequency:.2f} Hz, damping ratio {mode.damping_ratio:.4f}, AF {mode.amplification_factor:.1f}")\n'
            "print()\nprint(panel.summary())\nprint()\nprint(panel.result.findings.to_text())"
        ),
    ],
    "03_what_if.ipynb": [
        new_markdown_cell(
            "# What-if study: support stiffness, mass, speed range, skip bands, tolerance\n\n"
            "Scale the stiffness of the chosen springs and the chosen masses, move the speed range, add a "
            "drive skip band, and see the margins move. The buttons find the smallest stiffness or mass "
            "change that makes every check pass; the grey bands show each natural frequency over the "
            "support-stiffness tolerance, and the checks are evaluated over the whole band.\n\n"
        ),
        code("import resonance as R\nfrom resonance.ui import WhatIfPanel"),
        code(
            'scenario = R.load("scenarios/feed_pump_foundation.toml")\npanel = WhatIfPanel(scenario)\npanel',
            widget=True,
        ),
        new_markdown_cell("The scenario as loaded, before any control is moved:"),
        code("print(panel.summary())"),
        new_markdown_cell(
            "The smallest fixes, from the engine (the panel's buttons find the same and set their slider; "
            "later cells leave the panel above untouched, so a shared dashboard shows what it computed):"
        ),
        code(
            "from resonance.kinds.support.whatif import check_scaled, smallest_change, tolerance_check\n\n"
            'mass_fix = smallest_change(scenario, "mass")\n'
            "print(mass_fix.describe(scenario.whatif.vary_masses))\n"
            'stiffness_fix = smallest_change(scenario, "stiffness")\n'
            "print(stiffness_fix.describe(scenario.whatif.vary_springs))\n"
            "print(check_scaled(scenario, stiffness_scale=stiffness_fix.scale).summary())\n"
            "print(tolerance_check(scenario, stiffness_scale=stiffness_fix.scale).summary())"
        ),
        new_markdown_cell(
            "The stiffness fix passes at its nominal value but not over the whole +/- 30 % band: the "
            "margin is too thin to rely on an uncertain support stiffness. A drive skip band is another "
            "remedy; tick *drive skip band* and move it over the failing coincidence."
        ),
    ],
    "04_calculation_record.ipynb": [
        new_markdown_cell(
            "# Calculation record\n\n"
            "Load a scenario file, run every check, read the record (inputs, assumptions, methods and "
            "references, results, verdicts, cautions) and export it as a self-contained HTML file "
            "(figures included, readable offline) and a JSON file. The same record comes from the command "
            "line: `python -m resonance check scenarios/feed_pump_foundation.toml --html record.html "
            "--json record.json`. The record carries the cautions; read them before relying on any result."
        ),
        code("from resonance.ui import RecordPanel"),
        code('panel = RecordPanel("scenarios/feed_pump_foundation.toml", output_dir="records")\npanel', widget=True),
        new_markdown_cell("The record of the scenario as loaded (its caution closes the record in the panel above):"),
        code("print(panel.record.body)"),
        new_markdown_cell("Export (the panel's button does the same):"),
        code("html_path, json_path = panel.export()\nprint(html_path.as_posix(), json_path.as_posix())"),
    ],
    "05_rotor_critical_speeds.ipynb": [
        new_markdown_cell(
            "# Rotor critical speeds: Campbell diagram, unbalance response, separation margins\n\n"
            "A between-bearings fan rotor (shaft finite elements with gyroscopic moments, a rigid impeller, "
            "sleeve bearings whose stiffness rises with speed). Move the **speed range** and the **bearing "
            "stiffness and damping** factors: the Campbell diagram (forward whirl solid, backward dotted), the "
            "critical speeds where the 1x line crosses a forward branch, the unbalance response with its "
            "half-power AF, the API separation-margin verdicts, the stability (log decrement) and the shaft "
            "vibration against the API limit all follow. The critical speed map shows where the bearings sit "
            "between soft and rigid supports.\n\n"
        ),
        code("import resonance as R"),
        code(
            'scenario = R.load("scenarios/fan_rotor.toml")\npanel = R.panel(scenario)\npanel',
            widget=True,
        ),
        new_markdown_cell("The verdict, critical speeds and findings for the scenario as loaded:"),
        code("print(panel.summary())\nprint()\nprint(panel.result.findings.to_text())"),
        new_markdown_cell(
            "What if the drive ran up to 2200 rpm? The 1x critical near 2530 rpm is then only 15 % above the "
            "range while the API rule asks about 25 % for its amplification factor (computed here without "
            "touching the panel; move its slider to see the same)."
        ),
        code(
            "from resonance.checks.speed_range import operating_range\nfrom resonance.kinds.rotor import run_rotor_study\n\n"
            "faster = scenario.replace(speed=operating_range(900, 2200))\nprint(run_rotor_study(faster).summary())"
        ),
    ],
    "06_field_verification.ipynb": [
        new_markdown_cell(
            "# Field verification: coast-down and impact test against the design model\n\n"
            "The design model of a fan on its pedestal passed its margin check. On site, a coast-down "
            "(speed, amplitude, phase) and an impact test of the stopped machine were recorded (the files in "
            "`data/` are synthesized from an invented machine with noise). The panel finds the resonances "
            "(amplitude peaks confirmed by the phase change), their AF by the half-power method, fits a modal "
            "model to amplitude and phase together (Bode and polar views), checks the measured criticals by "
            "the same rule as the model, and tunes the floor stiffness so the model's modes match the impact "
            "test's. Move the **speed range**, the **channel** and the **fitting band**.\n\n"
        ),
        code("import resonance as R\nfrom resonance.ui import FieldPanel"),
        code('scenario = R.load("scenarios/fan_on_pedestal.toml")\nprint(R.run(scenario).result.summary())'),
        new_markdown_cell("What the design model said (above) and what the measurements say:"),
        code('panel = FieldPanel(scenario, base_dir="scenarios")\npanel', widget=True),
        code("print(panel.summary())\nprint()\nprint(panel.result.tuned_study.findings.to_text())"),
        new_markdown_cell(
            "The measured resonance sits just under 15 % above the maximum speed, short of the flat 15 % the "
            "scenario requires for a support mode: the field check fails where the design model passed. The "
            "tuned model (floor 25 % softer than designed) puts it a few tenths of a percent on the passing "
            "side: a margin that thin on an uncertain floor is no margin; stiffen the floor or lower the "
            "maximum speed, and re-measure. The same verification runs headless: "
            "`python -m resonance check scenarios/fan_on_pedestal.toml`."
        ),
    ],
    "07_torsional_train.ipynb": [
        new_markdown_cell(
            "# Torsional train: natural frequencies, every shaft's excitations, margins and dynamic torque\n\n"
            "A drive-fed motor, a flexible coupling, a speed-increasing gearbox and a compressor as one train "
            "(each shaft at its own speed, all referred to the motor's shaft by the ratio squared). Move the "
            "**speed range**, the **coupling stiffness** (the maker's data carry a tolerance, and a change of "
            "coupling is the usual fix) and the **damping**: the interference diagram (each shaft's 1x and 2x, "
            "the gear mesh and the motor's twice electrical frequency against the torsional modes), the "
            "findings by the torsional rule, the mode shapes with the element that takes most of the twist, "
            "and the dynamic torque in every shaft and coupling under the scenario's harmonic torques all "
            "follow. The allowables in the demo are invented: take them from the coupling maker and the "
            "governing fatigue code.\n\n"
        ),
        code(
            "import resonance as R\n"
            "from resonance.kinds.torsion.study import run_torsion_study\n"
            "from resonance.kinds.torsion.train import scale_couplings"
        ),
        code(
            'scenario = R.load("scenarios/compressor_train.toml")\npanel = R.panel(scenario)\npanel',
            widget=True,
        ),
        new_markdown_cell("The verdict, modes and findings for the scenario as loaded:"),
        code("print(panel.summary())\nprint()\nprint(panel.result.findings.to_text())"),
        new_markdown_cell(
            "The coupling mode sits 9.4 % below the range against the motor's 1x, short of the 10 % the "
            "scenario asks. Two ways out, computed here without touching the panel (move its coupling slider "
            "to see the same): a softer coupling moves the mode further below the range, a much stiffer one "
            "above it. Either must still clear every other excitation, which the study checks."
        ),
        code(
            "for factor in (0.8, 2.5):\n"
            "    changed = run_torsion_study(scenario.replace(train=scale_couplings(scenario.train, factor)))\n"
            '    print(f"coupling stiffness x{factor}: {changed.modes[0].frequency:.2f} Hz, {changed.verdict}")\n'
            '    print("  " + changed.findings.summary())'
        ),
        new_markdown_cell(
            "The same study runs headless and writes its record (text, JSON and HTML with these figures): "
            "`python -m resonance check scenarios/compressor_train.toml --html train.html --json train.json`."
        ),
    ],
    "08_uncertainty_and_fixes.ipynb": [
        new_markdown_cell(
            "# Uncertainty and combined fixes: how likely a margin fails, what drives it, which two changes fix it\n\n"
            "The booster pump on its baseplate and block (notebook 02) with its least certain inputs given "
            "distributions in the scenario's `[uncertainty]` table: the soil and grout stiffness, the mounting, "
            "the machine and block masses and the damping, each as a factor on its nominal value. Thousands of "
            "variants are checked by the scenario's rules in one batched solve. Change the **samples**, the "
            "**sampler** and its **seed**: the probability that a margin fails, the distribution of the worst "
            "margin, the probability of failure per finding and the inputs that drive it follow. The map below "
            "shows the worst margin over two combined changes (the mounting stiffness and the machine mass) "
            "with the passing region outlined and the smallest combined fix marked; move its **span**. The "
            "distributions are judgements, not data: the probability is only as good as they are.\n\n"
        ),
        code("import resonance as R\nfrom resonance.ui import UncertaintyPanel"),
        code(
            'scenario = R.load("scenarios/feed_pump_foundation.toml")\npanel = UncertaintyPanel(scenario)\npanel',
            widget=True,
        ),
        new_markdown_cell("What the panel says for the scenario as loaded (seeded: the same numbers every run):"),
        code(
            "print(panel.summary())\nprint()\nfor mode, excitation, p in panel.result.rows():\n"
            '    print(f"{100 * p:5.1f} %  {mode} x {excitation}")'
        ),
        new_markdown_cell(
            "The same study runs in the `check` command with the scenario's record, and on several cores or a "
            "Dask cluster: `python -m resonance check scenarios/feed_pump_foundation.toml --workers 2` or "
            "`--scheduler tcp://host:8786`; in a notebook, pass `executor=DaskExecutor(client)` to "
            "`resonance.studies.uncertainty.run_uncertainty` with an open `dask.distributed.Client`. The result does not "
            "depend on where it ran."
        ),
    ],
    "09_supports_in_space.ipynb": [
        new_markdown_cell(
            "# Supports in space: a fan on isolators on a block on soil, every mode and every direction\n\n"
            "The fan and its motor (a rigid body with six coordinates) bolted to a steel skid, the skid on eight "
            "spring isolators on a concrete block, the block on soil (a rigid footing on an elastic half-space: stiffness and radiation damping "
            "of sliding, vertical, rocking and torsion). Move the **speed range**, the **damping**, the **soil's "
            "shear modulus** (the least certain input) and the **isolators' stiffness**: the modes in words "
            "(which body slides, rocks or twists), the findings by the flat margin, the chosen mode in 3D and "
            "the 1x unbalance response at the fan bearings in x, y and z follow. Soil properties belong to a "
            "geotechnical engineer; the formulas are the textbook ones (from memory, see `resonance.kinds.space.soil`).\n\n"
        ),
        code("import resonance as R"),
        code(
            'scenario = R.load("scenarios/fan_skid_block.toml")\npanel = R.panel(scenario)\npanel',
            widget=True,
        ),
        new_markdown_cell("The verdict, the modes in words and the vibration at the bearings, as loaded:"),
        code(
            "print(panel.summary())\nprint()\nfor i, mode in enumerate(panel.result.shapes):\n"
            '    print(f"mode {i + 1}: {mode.frequency:6.2f} Hz, damping {mode.damping_ratio:.3f}, {mode.words}")'
        ),
        new_markdown_cell(
            "The machine's rocking modes on the isolators sit in or near the speed range against 1x, and the block's "
            "modes, heavily "
            "damped by radiation into the soil, against 1x and 2x: the flat rule counts no damping, so the "
            "verdict is FAIL. Softer isolators (move their factor to about 0.5) put the machine's modes below the "
            "range; the block's need a stiffer or larger footing. The same study runs headless: "
            "`python -m resonance check scenarios/fan_skid_block.toml --html block.html`."
        ),
    ],
}


def main() -> None:
    # Optional arguments pick notebooks by the start of their name (``04 07``); none: every notebook.
    wanted = sys.argv[1:]
    for name, cells in NOTEBOOKS.items():
        if wanted and not any(name.startswith(w) for w in wanted):
            continue
        for number, cell in enumerate(cells):
            cell["id"] = f"cell-{number}"  # stable ids keep re-builds' diffs to what changed
            cell["source"] = cell["source"].rstrip()
        notebook = new_notebook(cells=cells)
        notebook.metadata["kernelspec"] = {"name": "python3", "display_name": "Python 3", "language": "python"}
        path = HERE / name
        nbformat.write(notebook, path)
        subprocess.run(
            [
                sys.executable,
                "-m",
                "jupyter",
                "nbconvert",
                "--execute",
                "--to",
                "notebook",
                "--inplace",
                "--ExecutePreprocessor.store_widget_state=False",
                "--ExecutePreprocessor.record_timing=False",
                str(path),
            ],
            check=True,
            cwd=HERE,
        )
        print(f"wrote and executed {path.relative_to(HERE.parent)} ({path.stat().st_size // 1024} KiB)")


if __name__ == "__main__":
    main()
