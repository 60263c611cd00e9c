#include "methods/beam/beam.h"

namespace trivet {

const char* support_type_name(SupportType type) {
  switch (type) {
    case SupportType::Fixed: return "fixed";
    case SupportType::Pinned: return "pinned";
    case SupportType::Roller: return "roller";
    case SupportType::Free: return "free";
    case SupportType::Spring: return "spring";
    case SupportType::Guided: return "guided";
  }
  return "?";
}

const char* load_type_name(LoadType type) {
  switch (type) {
    case LoadType::Point: return "point";
    case LoadType::Udl: return "udl";
    case LoadType::Linear: return "linear";
    case LoadType::Couple: return "couple";
  }
  return "?";
}

const char* method_status_name(MethodStatus s) {
  switch (s) {
    case MethodStatus::Ok: return "ok";
    case MethodStatus::NotApplicable: return "not-applicable";
    case MethodStatus::Failed: return "failed";
  }
  return "?";
}

}  // namespace trivet
