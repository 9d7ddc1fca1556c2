openDemoWithSegmentedLine();
// a point selection on the stimulation spot, 15 um (75 pixels of 0.2 um) along the demo's path, as a user would
// click it with the point tool; Analyze Session Folder then offers it as the stimulus spot
getSelectionCoordinates(xs, ys);
left = 75;
for (i = 0; i + 1 < xs.length && left > 0; i++) {
    seg = sqrt(pow(xs[i + 1] - xs[i], 2) + pow(ys[i + 1] - ys[i], 2));
    if (left <= seg) {
        px = xs[i] + (xs[i + 1] - xs[i]) * left / seg;
        py = ys[i] + (ys[i + 1] - ys[i]) * left / seg;
    }
    left = left - seg;
}
setSlice(21);
makePoint(round(px), round(py));
// no options: the dialog stays open (the harness reports it as blocking)
run("Analyze Session Folder...");
