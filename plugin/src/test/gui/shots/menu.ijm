openDemoWithSegmentedLine();
call("MenuOpener.openLater", "Plugins", "Dendrokin");
