"""What people read and files receive: text for the terminal, number formatting, atomic writes."""
