"""The outside sources the tests cite, spelled once (author, title, edition, section).

A test that checks the engine against one of them carries
``@pytest.mark.source(...)`` with the source and the section it uses, so that
``pytest -m source --collect-only -q`` lists every such check.
"""

TUPPER = "Tupper, Introduction to Naval Architecture, ch. 4 'Flotation and stability'"
BARRASS = "Barrass & Derrett, Ship Stability for Masters and Mates, 6th ed. (2006)"
WIGLEY = (
    "Wigley, 'A comparison of experiment and calculated wave-profiles and wave-resistances "
    "for a form having parabolic waterlines', Proc. R. Soc. Lond. A 144 (1934)"
)
ITTC = "ITTC Recommended Procedure 7.5-02-01-03, Fresh Water and Seawater Properties (2011)"
IMO_IS = "IMO, International Code on Intact Stability 2008 (MSC.267(85))"
IMO_A749 = "IMO Resolution A.749(18), Code on Intact Stability (1993), 3.5.2.7"
ISO_14946 = "ISO 14946:2021, Small craft - Maximum load capacity (75 kg per person)"
ISO_12217_3 = "ISO 12217-3, Small craft - Stability and buoyancy assessment, boats < 6 m"
CFR_170_090 = "46 CFR 170.090, assumed average weight per person 185 lb (since 2011)"
MGN_280 = "UK MCA MGN 280(M), Small Commercial Vessel Code, section 11.4 heeling test"
CGPM = "3rd CGPM (1901), standard acceleration of gravity 9.80665 m/s^2"
BRITANNICA = "Encyclopaedia Britannica, 'naval architecture - stability' (w d cos = Delta GZ)"
SHAPELY = "shapely 2 (GEOS) polygon clipping and centroids"
TRIMESH = "trimesh: plane slice of a closed triangle mesh, capped, volume and centre of mass"
SCIPY = "scipy (brentq root finding, integrate.quad / trapezoid)"
BURDEN = "Burden & Faires, Numerical Analysis, composite trapezoidal rule error O(h^2)"
