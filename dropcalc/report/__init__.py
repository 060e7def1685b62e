"""The PDF report: data gathered from a scenario, figures, and the reportlab document."""
