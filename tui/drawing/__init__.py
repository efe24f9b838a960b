"""What the widgets draw with that is not a widget: a braille canvas, a share bar."""
