// Reads a 3MF file with the 3MF Consortium's reference library (lib3mf 1.x, Debian's lib3mf-dev) and
// prints one line per build item: "<object id> minX minY minZ maxX maxY maxZ" of the item's mesh
// after its build transform. Built and run by tests/integration/plate-orientation.test.ts.
#include <Model/COM/NMR_DLLInterfaces.h>
#include <cfloat>
#include <cstdio>
#include <vector>
using namespace NMR;

#define CHECK(x) do { if ((x) != LIB3MF_OK) { std::fprintf(stderr, "lib3mf call failed: %s\n", #x); return 2; } } while (0)

int main(int argc, char** argv) {
  if (argc != 2) { std::fprintf(stderr, "usage: lib3mf-dump FILE.3mf\n"); return 1; }
  PLib3MFModel* model = nullptr;
  CHECK(lib3mf_createmodel(&model));
  PLib3MFModelReader* reader = nullptr;
  CHECK(lib3mf_model_queryreader(model, "3mf", &reader));
  CHECK(lib3mf_reader_readfromfileutf8(reader, argv[1]));
  PLib3MFModelBuildItemIterator* items = nullptr;
  CHECK(lib3mf_model_getbuilditems(model, &items));
  BOOL more = false;
  CHECK(lib3mf_builditemiterator_movenext(items, &more));
  while (more) {
    PLib3MFModelBuildItem* item = nullptr;
    CHECK(lib3mf_builditemiterator_getcurrent(items, &item));
    DWORD id = 0;
    CHECK(lib3mf_builditem_getobjectresourceid(item, &id));
    PLib3MFModelObjectResource* object = nullptr;
    CHECK(lib3mf_builditem_getobjectresource(item, &object));
    BOOL isMesh = false;
    CHECK(lib3mf_object_ismeshobject(object, &isMesh));
    if (!isMesh) { std::fprintf(stderr, "build item %u is not a mesh object\n", (unsigned)id); return 3; }
    MODELTRANSFORM t;
    BOOL has = false;
    CHECK(lib3mf_builditem_hasobjecttransform(item, &has));
    if (has) CHECK(lib3mf_builditem_getobjecttransform(item, &t));
    DWORD n = 0;
    CHECK(lib3mf_meshobject_getvertexcount(object, &n));
    std::vector<MODELMESHVERTEX> v(n);
    DWORD got = 0;
    if (n) CHECK(lib3mf_meshobject_getvertices(object, v.data(), n, &got));
    double lo[3] = {DBL_MAX, DBL_MAX, DBL_MAX}, hi[3] = {-DBL_MAX, -DBL_MAX, -DBL_MAX};
    for (DWORD i = 0; i < n; i++) {
      const float* p = v[i].m_fPosition;
      double q[3];
      for (int r = 0; r < 3; r++) q[r] = has ? t.m_fFields[r][0] * p[0] + t.m_fFields[r][1] * p[1] + t.m_fFields[r][2] * p[2] + t.m_fFields[r][3] : p[r];
      for (int r = 0; r < 3; r++) { if (q[r] < lo[r]) lo[r] = q[r]; if (q[r] > hi[r]) hi[r] = q[r]; }
    }
    std::printf("%u %.4f %.4f %.4f %.4f %.4f %.4f\n", (unsigned)id, lo[0], lo[1], lo[2], hi[0], hi[1], hi[2]);
    lib3mf_release(object);
    lib3mf_release(item);
    CHECK(lib3mf_builditemiterator_movenext(items, &more));
  }
  lib3mf_release(items);
  lib3mf_release(reader);
  lib3mf_release(model);
  return 0;
}
