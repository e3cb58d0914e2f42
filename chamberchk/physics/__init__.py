"""Pure physics kernels of chamberchk.

Every function here takes and returns SI floats or numpy arrays; no pint, no TOML, no
recipe objects. Each module covers one physical topic and each function's docstring names its
model, validity range and published source.
"""
