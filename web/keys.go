package web

import (
	"strings"

	"github.com/vugu/vugu/js"
)

// Undo is the page's, in a field too: Ctrl+Z (Cmd+Z) goes back one edit of
// the document and Ctrl+Shift+Z or Ctrl+Y applies it again, so that what a
// field shows never differs from what is computed. A field holding typing
// not yet applied (the change has not fired) first drops that typing: it
// shows the document's value again. The paste box, whose text is not part
// of the document, keeps the browser's own undo.

// listenKeys binds the undo and redo keys on the whole page.
func (c *Root) listenKeys() {
	c.keys = js.FuncOf(func(_ js.Value, args []js.Value) any {
		e := args[0]
		if !(e.Get("ctrlKey").Bool() || e.Get("metaKey").Bool()) || e.Get("altKey").Bool() {
			return nil
		}
		key := strings.ToLower(e.Get("key").String())
		if key != "z" && key != "y" {
			return nil
		}
		redo := key == "y" || e.Get("shiftKey").Bool()
		switch undoTarget(e.Get("target")) {
		case browserUndo:
			return nil
		case fieldTyping:
			e.Call("preventDefault")
			t := e.Get("target")
			t.Set("value", committed(t))
			return nil
		}
		e.Call("preventDefault")
		go func() {
			c.env.Lock()
			defer c.env.UnlockRender()
			if redo {
				c.Redo()
			} else {
				c.Undo()
			}
		}()
		return nil
	})
	js.Global().Get("document").Call("addEventListener", "keydown", c.keys)
}

// What the undo keys act on.
const (
	documentUndo = iota // the document's history
	fieldTyping         // a field's typing not yet applied: drop it
	browserUndo         // text that is not the document's (the paste box)
)

// undoTarget says what the undo keys act on when target has the focus.
func undoTarget(target js.Value) int {
	if !target.Truthy() {
		return documentUndo
	}
	tag := strings.ToLower(target.Get("tagName").String())
	if tag != "input" && tag != "textarea" {
		return documentUndo
	}
	typ := strings.ToLower(target.Get("type").String())
	if typ == "checkbox" || typ == "file" {
		return documentUndo
	}
	if !isDocumentField(target) {
		return browserUndo
	}
	if target.Get("value").String() != committed(target) {
		return fieldTyping
	}
	return documentUndo
}

// isDocumentField reports a field that shows a value of the document: a
// field of an input table, or one that carries its applied value in
// data-committed.
func isDocumentField(el js.Value) bool {
	if el.Call("hasAttribute", "data-committed").Bool() {
		return true
	}
	return el.Call("closest", "table.data").Truthy()
}

// committed is the value of the document a field shows: its
// data-committed attribute, else (input tables) its default value.
func committed(el js.Value) string {
	if el.Call("hasAttribute", "data-committed").Bool() {
		return el.Call("getAttribute", "data-committed").String()
	}
	return el.Get("defaultValue").String()
}

// Undo goes back one edit.
func (c *Root) Undo() {
	defer c.guard()
	if err := c.S.Undo(); err != nil {
		c.S.Message = err.Error()
	}
}

// Redo applies the last undone edit again.
func (c *Root) Redo() {
	defer c.guard()
	if err := c.S.Redo(); err != nil {
		c.S.Message = err.Error()
	}
}

// CanUndo reports whether undo has something to do.
func (c *Root) CanUndo() bool { return c.S != nil && c.S.CanUndo() }

// CanRedo reports whether redo has something to do.
func (c *Root) CanRedo() bool { return c.S != nil && c.S.CanRedo() }
