"""uvcheck: screening of lamps sold as germicidal, UV-sterilising or disinfecting.

The package is layered (see DEVELOPERS.md): readers produce a :class:`~uvcheck.spectrum.Spectrum`,
pure evaluators turn it into named result objects, and renderers print or write them.
Importing this package is cheap: numpy and the other scientific libraries load only in the
modules that need them.
"""

__version__ = "0.1.0"
__all__ = ["__version__"]
