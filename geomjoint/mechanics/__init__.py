"""Pure-number joint mechanics (numpy/scipy only; never imports a CAD library)."""
