"""The engine: catalogue, profile, index, similarity, suggestions and explanations. No Qt here."""
