// a table of standards of our own (illustrative numbers), two replicates per concentration
csv = "concentration_uM,intensity\n0,212\n0,205\n0.05,331\n0.05,322\n0.1,452\n0.1,470\n0.25,802\n0.25,781\n"
    + "0.5,1190\n0.5,1215\n1,1598\n1,1570\n2.5,1985\n2.5,2010\n10,2270\n10,2255\n";
File.saveString(csv, tmp + "standards.csv");
run("Calibration from Standards...", "standards=table table=[" + tmp + "standards.csv] concentrations=[] background=0"
    + " save=[" + tmp + "indicator.json]");
