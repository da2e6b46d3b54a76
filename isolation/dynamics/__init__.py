"""Dynamics: structural models (planar and plan), the response-history engine, isolator force laws, energy and
response measures."""
