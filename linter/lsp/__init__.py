"""``packwarden lsp``: the review in the editor, as a Language Server Protocol server over stdio.

Two modules, so the part that knows packwarden can be read and tested without the protocol:

- :mod:`.live` lints the editor's texts with the engine and says what to show (protocol-free
  :class:`~.live.Note` records and hover text), keeping only what the open documents need;
- :mod:`.server` is the protocol (pygls): document sync, debouncing, publishing, hover.

Neither is imported by ``packwarden check``: pygls alone takes about a third of a second to import.
"""
