"""Small questions: a choice between a few answers, each on its own key; a file name to save as."""

from __future__ import annotations

from pathlib import Path
from typing import TypeVar

from textual import events
from textual.app import ComposeResult
from textual.binding import Binding
from textual.containers import Vertical
from textual.widgets import Input, Label, Static
from textual.widgets.input import Selection

from ..modal import Dialog
from ..state.values import shown_path

ResultT = TypeVar("ResultT")

FORM_KEYS = "Enter: next field (keeps on the last)   Tab/Shift+Tab: move   Esc: cancel"
"""The key line of every dialog with several fields: one rule for all of them."""
FORM_HINT = "Enter on the last field keeps, Esc cancels"


class ChoiceScreen(Dialog[str | None]):
    """A question with a few answers; each answer has a key. Escape picks the escape answer
    (or None when there is none)."""

    QUIT_PASSES = False  # the question may be the one a quit asks

    DEFAULT_CSS = """
    ChoiceScreen { align: center middle; }
    ChoiceScreen > Vertical {
        width: 64; max-width: 95%; height: auto; border: thick $warning; padding: 1 2;
        background: $surface;
    }
    ChoiceScreen .choice-title { text-style: bold; margin-bottom: 1; }
    ChoiceScreen .choice-keys { margin-top: 1; color: $text-muted; }
    """

    def __init__(self, title: str, question: str, choices: list[tuple[str, str, str]]) -> None:
        super().__init__()
        self.title_text = title
        self.question = question
        self.choices = choices
        self._keys = {key: value for key, value, _ in choices}
        for key, value, label in choices:
            self._bindings.bind(key, f"choose('{value}')", label, show=True)

    def compose(self) -> ComposeResult:
        with Vertical():
            yield Label(self.title_text, classes="choice-title", markup=False)
            yield Static(self.question, markup=False)
            keys = "   ".join(f"{'Esc' if k == 'escape' else k}: {label}"
                              for k, _, label in self.choices)
            yield Static(keys, classes="choice-keys", markup=False)

    def action_choose(self, value: str) -> None:
        self.dismiss(value)

    CLOSE_HINT = "answer, or Esc"

    def on_key(self, event: events.Key) -> None:
        if event.key == "escape" and "escape" not in self._keys:
            self.dismiss(None)
            return
        super().on_key(event)


class SaveAsScreen(Dialog[Path | None]):
    """Ask for a file name (in ``folder`` unless the person types a path)."""

    BINDINGS = [Binding("escape", "cancel", "Cancel", id="dialog-cancel")]
    CLOSE_HINT = "Enter saves, Esc cancels"
    DEFAULT_CSS = """
    SaveAsScreen { align: center middle; }
    SaveAsScreen > Vertical {
        width: 72; max-width: 95%; height: auto; border: thick $primary; padding: 1 2;
        background: $surface;
    }
    SaveAsScreen .save-title { text-style: bold; }
    SaveAsScreen .save-folder { color: $text-muted; margin-bottom: 1; }
    SaveAsScreen .save-message { color: $error; }
    """

    def __init__(self, folder: Path, name: str, *, title: str = "Save site as",
                 suffix: str = ".toml", replace_ok: bool = False) -> None:
        super().__init__()
        self.folder = folder
        self.default = name
        self.title_text = title
        self.suffix = suffix
        self.replace_ok = replace_ok

    def compose(self) -> ComposeResult:
        with Vertical():
            yield Label(self.title_text, classes="save-title", markup=False)
            yield Label(f"in {shown_path(self.folder)}/ (or type a full path)",
                        classes="save-folder", markup=False)
            yield Input(self.default, id="save-name")
            yield Static("", classes="save-message", markup=False)
            yield Static("Enter: save   Esc: cancel", markup=False)

    def on_mount(self) -> None:
        boxes = self.query(Input)
        if not boxes:  # the app is closing (Ctrl+Q a moment before): nothing was composed
            return
        box = boxes.first()
        box.focus()
        stem_end = len(Path(self.default).stem)
        box.selection = Selection(0, stem_end)

    def target(self, text: str) -> Path | None:
        text = text.strip()
        if not text:
            return None
        double = self.suffix * 2
        if self.suffix and text.lower().endswith(double.lower()):
            # a name typed with its extension over the selected stem ("bldg7.toml" + ".toml")
            text = text[: -len(self.suffix)]
        path = Path(text).expanduser()
        if not path.is_absolute() and len(path.parts) == 1:
            path = self.folder.expanduser().absolute() / path
        if not path.suffix:
            path = path.with_suffix(self.suffix)
        return path

    def on_input_submitted(self, event: Input.Submitted) -> None:
        event.stop()
        path = self.target(event.value)
        message = self.query_one(".save-message", Static)
        if path is None:
            message.update("Type a file name.")
        elif path.is_dir():
            message.update(f"{path} is a folder: type a file name.")
        else:
            self.dismiss(path)

    def action_cancel(self) -> None:
        self.dismiss(None)
