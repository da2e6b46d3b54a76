"""Pieces of the live explorer that are not its callbacks.

The callbacks themselves (settings in, answer out) are plain functions in
:mod:`isolation.app.explorer.answers`. This sub-package holds what they lean on:

* :mod:`~isolation.app.explorer.controls` - one table of every control (field,
  label, kind of quantity, range in SI, which bearing type or code basis it
  belongs to) and the unit factors for SI/US display;
* :mod:`~isolation.app.explorer.study_file` - the current alternative as a study
  mapping / TOML text that ``python -m isolation check`` accepts;
* :mod:`~isolation.app.explorer.advice` - plausibility warnings for impossible or
  absurd input;
* :mod:`~isolation.app.explorer.tables` - the answer as HTML tables (re-exported
  from :mod:`isolation.app.explorer.answers`);
* :mod:`~isolation.app.explorer.browser` - the page in headless Chromium, for the
  browser tests and the latency benchmark;
* :mod:`~isolation.app.explorer.live` - ipywidgets and bqplot wiring (no logic);
* :mod:`~isolation.app.explorer.app` - ``python -m isolation explore``: the
  explorer as a stand-alone page served by Voila on 127.0.0.1.

Scope: concept-stage screening, not construction design.
"""
