"""Views of a review as text: terminal, Markdown, JSON. Pure functions of a Review; never compute."""
