openDemoWithSegmentedLine();
// no options: the dialog stays open with the band outline drawn on the movie (the harness reports it as blocking)
run("Kymograph Along Line...");
