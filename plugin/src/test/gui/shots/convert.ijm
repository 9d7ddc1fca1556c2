placeLog();
openDemoWithSegmentedLine();
run("Kymograph Along Line...", "lines=[current selection] pixel=0.2 frame=0.5 band=1 step=0.2 save=[]");
run("Convert to Concentration...", "method=single-wavelength background=120 flag=0.8 reject=0.95"
    + " kd=0.345 fmin=300 fmax=3000");
