openDemoWithSegmentedLine();
run("Kymograph Along Line...", "lines=[current selection] pixel=0.2 frame=0.5 band=1 step=0.2 save=[]");
