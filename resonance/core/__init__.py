"""Core: the trade's unit registry, the input layer, the exceptions, and where work runs.

The input layer turns user text and quantities into SI floats with errors naming the field; the thread cap
and executors say where work runs. Imports nothing else of the package; every other layer may import it.
"""
