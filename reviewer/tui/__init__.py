"""The walkthrough: a full-screen terminal interface over one design's review.

Import :mod:`reviewer.tui.app` only when the interface is wanted: Textual is heavy, and the
command line's other paths never load it.
"""
