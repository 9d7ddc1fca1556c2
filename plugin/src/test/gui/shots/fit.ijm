sessionKymograph();
run("Fit Spread Models...", "models=[diffusion-decay, nagumo] time=9.75 position=15 criterion=aicc bootstrap=20 save=[]");
selectWindow("Fit of diffusion-decay: profiles (points: data, lines: model)");
setLocation(720, 560);
selectWindow("Dendrokin fits");
setLocation(10, 600);
if (isOpen("Dendrokin session demo-session")) { selectWindow("Dendrokin session demo-session"); run("Close"); }
if (isOpen("Log")) { selectWindow("Log"); setLocation(10, 120); }
