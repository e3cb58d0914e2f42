"""chamberchk: pre-check gas transport in deposition and etch recipes.

Public API::

    from chamberchk import load_recipe, evaluate
    evaluation = evaluate(load_recipe("recipes/ald-liner.toml"))
"""

__version__ = "0.1.0"

__all__ = ["__version__", "load_recipe", "evaluate", "InputError"]


def __getattr__(name):  # lazy: keep `import chamberchk` cheap for the CLI
    if name == "load_recipe":
        from .recipe import load_recipe
        return load_recipe
    if name == "evaluate":
        from .evaluate import evaluate
        return evaluate
    if name == "InputError":
        from .errors import InputError
        return InputError
    raise AttributeError(name)
