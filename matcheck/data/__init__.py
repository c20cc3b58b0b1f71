"""Learners' data: one row per learner, read only, never written or copied into reports.

``tables`` reads a CSV (or, with openpyxl installed, an XLSX) file into header and rows;
``spec`` validates the study file's ``[data]`` section; ``learners`` turns rows into typed
learner records with errors that name the file, the row and the column.
"""
