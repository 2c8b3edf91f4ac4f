"""The built-in editions, one module each, registered through entry points like any other."""
