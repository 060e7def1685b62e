"""The local browser page (``dropcalc serve``): a form that builds a scenario, and its answer.

The page adds no physics. It turns what the user typed into the scenario file that
``dropcalc report`` reads (:mod:`dropcalc.web.form`), loads that with the scenario loader and
runs the one job pipeline (:func:`dropcalc.analysis.job.run_job`); the routes are in
:mod:`dropcalc.web.app`, the server in :mod:`dropcalc.web.serve`.
"""
