"""Everything that calls the CAD kernel (OCP / cadquery) or a mesh library lives here."""
