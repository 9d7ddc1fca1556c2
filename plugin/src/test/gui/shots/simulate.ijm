placeLog();
openDemoWithSegmentedLine();
run("Simulate Along Line...", "model=diffusion-decay d=0.8 rate=0.05 threshold=0.2 time=9.75 position=15"
    + " width=1 amount=1.5 ends=no-flux grid=0.25 save=[]");
