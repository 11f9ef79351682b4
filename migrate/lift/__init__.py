"""Rules that turn Java idioms into the plan. Only this package and migrate.java know javalang."""
