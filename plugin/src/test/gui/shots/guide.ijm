run("User Guide...", "chapter=[Working in ImageJ]");
run("About Dendrokin");
