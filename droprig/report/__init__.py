"""The lift-permit annex (PDF) and its plan figure.

Entry point: :func:`droprig.report.annex.write_annex`. Nothing heavy is imported
here; reportlab loads with :mod:`droprig.report.annex`, and neither matplotlib
nor Qt is ever imported by this package.
"""
