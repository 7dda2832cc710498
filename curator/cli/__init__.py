"""The ``curator`` command: a thin layer over :mod:`curator.services`."""
