package org.dendrokin.cli;

/** Small SBML documents written for the tests. */
final class SbmlFixtures {
    private SbmlFixtures() {
    }

    /** A &lt;-&gt; B with an event that resets A: the event must be refused. */
    static String withEvent() {
        return """
                <?xml version="1.0" encoding="UTF-8"?>
                <sbml xmlns="http://www.sbml.org/sbml/level3/version1/core" level="3" version="1">
                  <model id="flip">
                    <listOfCompartments>
                      <compartment id="cell" size="1" constant="true" spatialDimensions="3"/>
                    </listOfCompartments>
                    <listOfSpecies>
                      <species id="A" compartment="cell" initialConcentration="1" hasOnlySubstanceUnits="false"
                               boundaryCondition="false" constant="false"/>
                      <species id="B" compartment="cell" initialConcentration="0" hasOnlySubstanceUnits="false"
                               boundaryCondition="false" constant="false"/>
                    </listOfSpecies>
                    <listOfParameters>
                      <parameter id="k" value="1" constant="true"/>
                    </listOfParameters>
                    <listOfReactions>
                      <reaction id="convert" reversible="false">
                        <listOfReactants><speciesReference species="A" stoichiometry="1" constant="true"/></listOfReactants>
                        <listOfProducts><speciesReference species="B" stoichiometry="1" constant="true"/></listOfProducts>
                        <kineticLaw><math xmlns="http://www.w3.org/1998/Math/MathML">
                          <apply><times/><ci>k</ci><ci>A</ci></apply></math></kineticLaw>
                      </reaction>
                    </listOfReactions>
                    <listOfEvents>
                      <event id="reset" useValuesFromTriggerTime="true">
                        <trigger initialValue="false" persistent="true"><math xmlns="http://www.w3.org/1998/Math/MathML">
                          <apply><lt/><ci>A</ci><cn>0.5</cn></apply></math></trigger>
                        <listOfEventAssignments>
                          <eventAssignment variable="A"><math xmlns="http://www.w3.org/1998/Math/MathML"><cn>1</cn></math>
                          </eventAssignment>
                        </listOfEventAssignments>
                      </event>
                    </listOfEvents>
                  </model>
                </sbml>
                """;
    }
}
