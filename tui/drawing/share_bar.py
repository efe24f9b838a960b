"""A branch's share of the total flow as a short bar of block characters and a percentage."""

from __future__ import annotations

import math

from rich.text import Text

_EIGHTHS = " ▏▎▍▌▋▊▉"


def share_bar(share: float, width: int = 6, style: str = "", reverse: str = "reverse") -> Text:
    """``share`` (a fraction, may be negative or NaN) as a bar ``width`` cells long + ``42%``.

    Eighth blocks give the bar a resolution of 1/(8·width); a reverse flow is drawn in the
    ``reverse`` style (the app passes its theme's error colour) and a NaN share (no total
    flow) as a dash.
    """
    if not math.isfinite(share):
        return Text("—".rjust(width + 5))
    fraction = min(abs(share), 1.0)
    eighths = round(fraction * width * 8)
    full, rest = divmod(eighths, 8)
    bar = "█" * full + (_EIGHTHS[rest] if rest else "")
    text = Text(bar.ljust(width), style=reverse if share < 0 else style)
    percent = share * 100
    text.append(f"{percent:4.1f}%" if abs(percent) < 10 else f"{percent:4.0f}%")
    return text
