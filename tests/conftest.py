import os

os.environ.setdefault("MPLBACKEND", "Agg")
# the tests never build start-up copies of the kernels (tests/edges/test_ahead.py does)
os.environ.setdefault("CYCJ_AHEAD", "0")
